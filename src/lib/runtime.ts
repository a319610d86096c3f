/**
 * Process-wide singletons.
 *
 * In production two copies of our modules live in one process: the Astro
 * bundle (dist/server) and the Node entry (server/, run through tsx). Both must
 * share one database handle, one exercise hub and one mailer, so each such
 * object is created once and kept on globalThis under a registered symbol.
 */
const REGISTRY = Symbol.for('rungwise.runtime');

type Registry = Map<string, unknown>;

function registry(): Registry {
  const holder = globalThis as typeof globalThis & { [REGISTRY]?: Registry };
  holder[REGISTRY] ??= new Map();
  return holder[REGISTRY];
}

export function shared<T>(name: string, create: () => T): T {
  const entries = registry();
  if (!entries.has(name)) entries.set(name, create());
  return entries.get(name) as T;
}

/** Put a value in place, e.g. a service the Node entry started. */
export function provide<T>(name: string, value: T): T {
  registry().set(name, value);
  return value;
}

export function lookup<T>(name: string): T | undefined {
  return registry().get(name) as T | undefined;
}

export function forget(name: string): void {
  registry().delete(name);
}
