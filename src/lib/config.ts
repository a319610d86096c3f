import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { dirname, resolve } from 'node:path';

/** Settings read from the environment, with the embedded defaults. */
export type Config = {
  databasePath: string;
  dataDir: string;
  port: number;
  host: string;
  publicUrl: string;
  smtpUrl: string | undefined;
  mailFrom: string;
  authSecret: string;
  signInLimitPerMinute: number;
  /** Off only for tests that send thousands of messages on purpose (RUNGWISE_SOCKET_LIMITS=off). */
  socketLimits: boolean;
};

export function databasePath(): string {
  const url = process.env.DATABASE_URL ?? './data/rungwise.db';
  return resolve(url.replace(/^file:/, ''));
}

export function loadConfig(): Config {
  const dbPath = databasePath();
  const dataDir = dirname(dbPath);
  const port = Number(process.env.PORT ?? 4321);
  const host = process.env.HOST ?? '0.0.0.0';
  const publicUrl = (process.env.PUBLIC_URL ?? `http://localhost:${port}`).replace(/\/$/, '');
  return {
    databasePath: dbPath,
    dataDir,
    port,
    host,
    publicUrl,
    smtpUrl: process.env.SMTP_URL || undefined,
    mailFrom: process.env.MAIL_FROM ?? 'Rungwise <rungwise@localhost>',
    authSecret: process.env.BETTER_AUTH_SECRET ?? persistedSecret(dataDir),
    signInLimitPerMinute: Number(process.env.RUNGWISE_SIGNIN_LIMIT ?? 10),
    socketLimits: process.env.RUNGWISE_SOCKET_LIMITS !== 'off',
  };
}

/**
 * Without BETTER_AUTH_SECRET, a random secret is made once and kept beside the
 * database, so sessions survive a restart of the embedded default set-up.
 */
function persistedSecret(dataDir: string): string {
  const file = resolve(dataDir, 'auth-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(32).toString('base64url');
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}
