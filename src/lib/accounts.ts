/** Accounts: created from accepted invitations (or by the demo seed), managed by admins. */
import { and, asc, eq, isNull } from 'drizzle-orm';
import { db, schema } from '../db/client';
import type { PlatformRole } from '../db/schema';
import { announceAccessChange } from './access-changes';
import { auth } from './auth';
import { HttpError } from './http';

export type NewAccount = { email: string; name: string; password: string; role: PlatformRole };

export async function createAccount(account: NewAccount): Promise<string> {
  const ctx = await auth().$context;
  const email = account.email.toLowerCase();
  if (await ctx.internalAdapter.findUserByEmail(email)) {
    throw new HttpError(409, 'An account with this e-mail address exists already', [
      { field: 'email', reason: 'already registered' },
    ]);
  }
  const hash = await ctx.password.hash(account.password);
  const created = await ctx.internalAdapter.createUser(
    { email, name: account.name, emailVerified: true, role: account.role },
    { method: 'email-password' },
  );
  await ctx.internalAdapter.linkAccount({ userId: created.id, providerId: 'credential', accountId: created.id, password: hash });
  return created.id;
}

export function listUsers() {
  return db()
    .select({
      id: schema.user.id,
      name: schema.user.name,
      email: schema.user.email,
      role: schema.user.role,
      deactivatedAt: schema.user.deactivatedAt,
      createdAt: schema.user.createdAt,
    })
    .from(schema.user)
    .orderBy(asc(schema.user.name))
    .all();
}

function activeAdmins(): number {
  return db()
    .select({ id: schema.user.id })
    .from(schema.user)
    .where(and(eq(schema.user.role, 'admin'), isNull(schema.user.deactivatedAt)))
    .all().length;
}

function findUser(id: string) {
  const row = db().select().from(schema.user).where(eq(schema.user.id, id)).get();
  if (!row) throw new HttpError(404, 'No such user');
  return row;
}

/** Refuse a change that would leave no active administrator. */
function keepOneAdmin(target: { role: PlatformRole; deactivatedAt: Date | null }) {
  if (target.role === 'admin' && !target.deactivatedAt && activeAdmins() <= 1) {
    throw new HttpError(409, 'This is the last active administrator; make someone else an administrator first');
  }
}

export function changeRole(userId: string, role: PlatformRole): void {
  const target = findUser(userId);
  if (target.role === role) return;
  keepOneAdmin(target);
  db().update(schema.user).set({ role, updatedAt: new Date() }).where(eq(schema.user.id, userId)).run();
}

/** Deactivated users cannot sign in and lose their open sessions and sockets at once. */
export function setActive(userId: string, active: boolean): void {
  const target = findUser(userId);
  if (!active) keepOneAdmin(target);
  db().transaction((tx) => {
    tx.update(schema.user)
      .set({ deactivatedAt: active ? null : new Date(), updatedAt: new Date() })
      .where(eq(schema.user.id, userId))
      .run();
    if (!active) tx.delete(schema.session).where(eq(schema.session.userId, userId)).run();
  });
  if (!active) announceAccessChange({ kind: 'account-closed', userId, reason: 'Your account was deactivated by an administrator' });
}
