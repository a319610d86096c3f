/**
 * The background services of one Rungwise process, shared by the production
 * entry (server/index.ts) and the dev server's integration hook.
 */
import { count } from 'drizzle-orm';
import { closeDatabase, db, migrateDatabase, schema } from '../src/db/client';
import { loadConfig } from '../src/lib/config';
import { MAIL_SINK_URL } from '../src/lib/mail';
import { forget, lookup, provide } from '../src/lib/runtime';
import { startMailSink, type MailSink } from './mail-sink';
import { seedDemo } from './seed';
import { exerciseHub } from './live/hub';

export type Services = { mailSink: MailSink | null; seeded: boolean; stop(): Promise<void> };

const SERVICES = 'services';

export async function startServices(): Promise<Services> {
  const running = lookup<Services>(SERVICES);
  if (running) return running;
  const config = loadConfig();
  migrateDatabase();
  const mailSink = config.smtpUrl ? null : await startMailSink();
  if (mailSink) provide(MAIL_SINK_URL, mailSink.url);
  const seeded = isEmpty() && process.env.RUNGWISE_SEED !== 'off';
  if (seeded) await seedDemo();
  exerciseHub().start();
  const services: Services = {
    mailSink,
    seeded,
    async stop() {
      exerciseHub().stop();
      await mailSink?.close();
      forget(MAIL_SINK_URL);
      closeDatabase();
      forget(SERVICES);
    },
  };
  return provide(SERVICES, services);
}

function isEmpty(): boolean {
  const row = db().select({ n: count() }).from(schema.user).get();
  return (row?.n ?? 0) === 0;
}

export function mailSinkStatus(): { mode: 'sink' | 'smtp'; url?: string } {
  const sink = lookup<Services>(SERVICES)?.mailSink;
  return sink ? { mode: 'sink', url: sink.url } : { mode: 'smtp' };
}
