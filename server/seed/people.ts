import type { PlatformRole } from '../../src/lib/roles';

/** The demo password of every seeded account; printed at start. */
export const DEMO_PASSWORD = 'serrin-demo-2026';

/** Invented people of the demo, one per role the product knows. */
export const DEMO_PEOPLE = {
  admin: { email: 'admin@rungwise.example', name: 'Rhea Castell', role: 'admin' },
  facilitator: { email: 'facilitator@rungwise.example', name: 'Ines Marlow', role: 'facilitator' },
  blue: { email: 'blue.lead@rungwise.example', name: 'Tomas Reyl', role: 'member' },
  blue2: { email: 'blue.analyst@rungwise.example', name: 'Pia Lindqvar', role: 'member' },
  red: { email: 'red.lead@rungwise.example', name: 'Darya Kovel', role: 'member' },
  mediator: { email: 'mediator@rungwise.example', name: 'Ilse Varga', role: 'member' },
  observer: { email: 'observer@rungwise.example', name: 'Oren Hale', role: 'member' },
  sponsor: { email: 'sponsor@rungwise.example', name: 'Maren Solt', role: 'member' },
} as const satisfies Record<string, { email: string; name: string; role: PlatformRole }>;

export type DemoPerson = keyof typeof DEMO_PEOPLE;
export type DemoIds = Record<DemoPerson, string>;
