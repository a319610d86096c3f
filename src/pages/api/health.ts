import { sql } from 'drizzle-orm';
import nodemailer from 'nodemailer';
import { db } from '../../db/client';
import { loadConfig } from '../../lib/config';
import { endpoint, json } from '../../lib/http';
import { MAIL_SINK_URL } from '../../lib/mail';
import { lookup } from '../../lib/runtime';

async function mailStatus() {
  const config = loadConfig();
  const url = config.smtpUrl ?? lookup<string>(MAIL_SINK_URL);
  if (!url) return { ok: false, mode: 'none', detail: 'no SMTP_URL and no built-in sink running' };
  const mode = config.smtpUrl ? 'smtp' : 'sink';
  const probe = nodemailer.createTransport({ url, connectionTimeout: 2000, greetingTimeout: 2000 } as Parameters<typeof nodemailer.createTransport>[0]);
  try {
    await probe.verify();
    return { ok: true, mode };
  } catch (error) {
    return { ok: false, mode, detail: error instanceof Error ? error.message : String(error) };
  } finally {
    probe.close();
  }
}

function databaseStatus() {
  try {
    const row = db().get<{ journal: string }>(sql`select journal_mode as journal from pragma_journal_mode`);
    return { ok: true, journal: row?.journal };
  } catch (error) {
    return { ok: false, detail: error instanceof Error ? error.message : String(error) };
  }
}

export const GET = endpoint(async () => {
  const database = databaseStatus();
  const mail = await mailStatus();
  const ok = database.ok && mail.ok;
  return json({ status: ok ? 'ok' : 'degraded', database, mail }, ok ? 200 : 503);
});
