import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { databasePath } from '../lib/config';
import { forget, lookup, shared } from '../lib/runtime';
import * as schema from './schema';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

function open(): Db {
  const file = databasePath();
  mkdirSync(dirname(file), { recursive: true });
  const sqlite = new Database(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  sqlite.pragma('synchronous = NORMAL');
  return drizzle({ client: sqlite, schema }) as Db;
}

/** The one database handle of this process. */
export function db(): Db {
  return shared('db', open);
}

export function migrateDatabase(migrationsFolder = resolve('drizzle')): void {
  migrate(db(), { migrationsFolder });
}

/** Checkpoint the WAL into the main file and close the handle. */
export function closeDatabase(): void {
  const handle = lookup<Db>('db');
  if (!handle) return;
  handle.$client.pragma('wal_checkpoint(TRUNCATE)');
  handle.$client.close();
  forget('db');
}

export { schema };
