import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { eq } from 'drizzle-orm';
import { db, schema } from '../db/client';
import { announceAccessChange } from './access-changes';
import { loadConfig } from './config';
import { passwordResetMail } from './mail-templates';
import { sendMail } from './mail';
import { shared } from './runtime';

/** The header our own HTTP layer sets from the socket's address (never from the client). */
export const CLIENT_IP_HEADER = 'x-rungwise-client-ip';

function createAuth() {
  const config = loadConfig();
  const origin = new URL(config.publicUrl);
  const loopbackTwins = [`http://localhost:${config.port}`, `http://127.0.0.1:${config.port}`];
  return betterAuth({
    appName: 'Rungwise',
    baseURL: config.publicUrl,
    basePath: '/api/auth',
    secret: config.authSecret,
    trustedOrigins: [origin.origin, ...loopbackTwins],
    database: drizzleAdapter(db(), { provider: 'sqlite', schema }),
    emailAndPassword: {
      enabled: true,
      disableSignUp: true,
      minPasswordLength: 10,
      resetPasswordTokenExpiresIn: 60 * 60,
      revokeSessionsOnPasswordReset: true,
      sendResetPassword: async ({ user, token }) => {
        const link = `${config.publicUrl}/reset-password?token=${encodeURIComponent(token)}`;
        await sendMail({ to: user.email, ...passwordResetMail(user.name, link) });
      },
    },
    user: {
      additionalFields: {
        role: { type: 'string', input: false, defaultValue: 'member', required: false },
        deactivatedAt: { type: 'date', input: false, required: false },
      },
    },
    session: { expiresIn: 60 * 60 * 24 * 7, updateAge: 60 * 60 * 24 },
    databaseHooks: {
      session: {
        create: {
          before: async (session) => {
            const owner = db().select().from(schema.user).where(eq(schema.user.id, session.userId)).get();
            if (!owner || owner.deactivatedAt) return false;
            return { data: session };
          },
        },
        delete: {
          // Signing out (or a session ending any other way) closes the sockets opened with it.
          after: async (session) => announceAccessChange({ kind: 'session-ended', sessionId: session.id, reason: 'This sign-in has ended (signed out). Sign in again to go on.' }),
        },
      },
    },
    rateLimit: {
      enabled: true,
      storage: 'memory',
      window: 60,
      max: 200,
      customRules: {
        '/sign-in/*': { window: 60, max: config.signInLimitPerMinute },
        '/request-password-reset': { window: 60, max: 5 },
      },
    },
    advanced: {
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
      database: { generateId: () => crypto.randomUUID() },
    },
    telemetry: { enabled: false },
  });
}

export type Auth = ReturnType<typeof createAuth>;

export function auth(): Auth {
  return shared('auth', createAuth);
}

export type SessionUser = {
  id: string;
  name: string;
  email: string;
  role: schema.PlatformRole;
};

/** The signed-in, active user behind these request headers and the session they came with, or null. */
export async function sessionFromHeaders(headers: Headers): Promise<{ user: SessionUser; sessionId: string } | null> {
  const found = await auth().api.getSession({ headers });
  if (!found) return null;
  const row = db().select().from(schema.user).where(eq(schema.user.id, found.user.id)).get();
  if (!row || row.deactivatedAt) return null;
  return { user: { id: row.id, name: row.name, email: row.email, role: row.role }, sessionId: found.session.id };
}

/** The signed-in, active user behind these request headers, or null. */
export async function userFromHeaders(headers: Headers): Promise<SessionUser | null> {
  return (await sessionFromHeaders(headers))?.user ?? null;
}
