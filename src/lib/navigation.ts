import type { PlatformRole } from './roles';

export type NavItem = { href: string; label: string };

/** The app frame's links for each platform role. */
export function navigationFor(role: PlatformRole): NavItem[] {
  const items: NavItem[] = [{ href: '/', label: 'Home' }];
  if (role === 'admin' || role === 'facilitator') {
    items.push({ href: '/studio', label: 'Studio' }, { href: '/exercises', label: 'Exercises' }, { href: '/invite', label: 'Invite' });
  }
  if (role === 'admin') items.push({ href: '/admin/users', label: 'Users' }, { href: '/admin/outbox', label: 'Outbox' });
  return items;
}

export const ROLE_LABELS: Record<PlatformRole, string> = {
  admin: 'Administrator',
  facilitator: 'Facilitator',
  member: 'Member',
};
