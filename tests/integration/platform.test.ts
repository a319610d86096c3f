import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, DEMO, openSocket, signIn, startApp, type App, type Client } from '../support/app';
import { linkIn, waitForMail } from '../support/mail';

let app: App;
let admin: Client;

beforeAll(async () => {
  app = await startApp();
  admin = await signIn(app, DEMO.admin);
});
afterAll(() => app?.stop());

describe('platform: one process with embedded defaults', () => {
  it('reports database and mail-sink health', async () => {
    const { status, body } = await anonymous(app).json('/api/health');
    expect(status).toBe(200);
    expect(body).toMatchObject({ status: 'ok', database: { ok: true, journal: 'wal' }, mail: { ok: true, mode: 'sink' } });
  });

  it('serves the sign-in page, with fonts from the app itself', async () => {
    const answer = await anonymous(app).fetch('/sign-in');
    const html = await answer.text();
    expect(answer.status).toBe(200);
    expect(html).toContain('Sign in');
    expect(html).not.toMatch(/https?:\/\/(?!127\.0\.0\.1|localhost)[^"']*\.(woff2?|js|css)/);
    const css = /href="(\/_astro\/[^"]+\.css)"/.exec(html)?.[1];
    expect(css).toBeTruthy();
    const sheet = await (await anonymous(app).fetch(css!)).text();
    expect(sheet).toContain('Libre Franklin');
    const font = /url\((\/_astro\/[^)]+\.woff2)\)/.exec(sheet)?.[1];
    expect((await anonymous(app).fetch(font!)).status).toBe(200);
  });

  it('signs in every demo account', async () => {
    for (const email of Object.values(DEMO)) {
      const client = await signIn(app, email);
      const { status, body } = await client.json('/api/me');
      expect(status).toBe(200);
      expect(body.user.email).toBe(email);
    }
  });

  it('redirects signed-out pages to sign-in and answers signed-out API calls with 401 JSON', async () => {
    const page = await anonymous(app).fetch('/admin/users');
    expect(page.status).toBe(302);
    expect(page.headers.get('location')).toBe('/sign-in?next=%2Fadmin%2Fusers');
    const api = await anonymous(app).json('/api/users');
    expect(api).toEqual({ status: 401, body: { error: 'Sign in first' } });
  });

  it('refuses wrong roles with 403 JSON, on the API and on the page', async () => {
    const facilitator = await signIn(app, DEMO.facilitator);
    expect(await facilitator.json('/api/users')).toEqual({ status: 403, body: { error: 'Only administrators manage users' } });
    expect((await facilitator.json('/api/outbox')).status).toBe(403);
    expect((await facilitator.fetch('/admin/outbox')).status).toBe(403);
    const member = await signIn(app, DEMO.blue);
    expect((await member.json('/api/invitations', { method: 'POST', json: { email: 'x@rungwise.example' } })).status).toBe(403);
    expect((await admin.json('/api/users')).status).toBe(200);
  });

  it('answers bad input with 400, the field and the reason', async () => {
    const { status, body } = await admin.json('/api/invitations', { method: 'POST', json: { email: 'not-an-address', role: 'king' } });
    expect(status).toBe(400);
    expect(body.fields.map((f: { field: string }) => f.field).sort()).toEqual(['email', 'role']);
    const broken = await admin.fetch('/api/invitations', { method: 'POST', body: '{oops', headers: { 'content-type': 'application/json' } });
    expect(broken.status).toBe(400);
    expect(await broken.json()).toMatchObject({ error: 'The request body is not valid JSON' });
  });
});

describe('platform: invitations are the only way in', () => {
  it('has no open sign-up', async () => {
    const { status } = await anonymous(app).json('/api/auth/sign-up/email', {
      method: 'POST',
      json: { email: 'walk-in@rungwise.example', password: 'long-enough-password', name: 'Walk In' },
    });
    expect(status).toBe(400);
  });

  it('mails an invitation whose link creates the account, once', async () => {
    const email = 'new.analyst@rungwise.example';
    expect((await admin.json('/api/invitations', { method: 'POST', json: { email, role: 'facilitator' } })).status).toBe(201);
    const mail = await waitForMail(admin, email, /invited/);
    const link = new URL(linkIn(mail, '/invitation?token='));
    const token = link.searchParams.get('token')!;

    const page = await anonymous(app).fetch(`/invitation?token=${token}`);
    expect(await page.text()).toContain(email);

    const short = await anonymous(app).json('/api/invitations/accept', { method: 'POST', json: { token, name: 'N', password: 'short' } });
    expect(short.status).toBe(400);
    expect(short.body.fields.map((f: { field: string }) => f.field).sort()).toEqual(['name', 'password']);

    const accept = await anonymous(app).fetch('/api/invitations/accept', {
      method: 'POST',
      json: { token, name: 'Noor Aldane', password: 'a-good-long-password' },
    });
    expect(accept.status).toBe(201);
    const cookie = accept.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const me = await fetch(`${app.url}/api/me`, { headers: { cookie } });
    expect(await me.json()).toMatchObject({ user: { email, name: 'Noor Aldane', role: 'facilitator' } });

    const again = await anonymous(app).json('/api/invitations/accept', { method: 'POST', json: { token, name: 'Noor', password: 'another-long-password' } });
    expect(again.status).toBe(410);
    expect((await signIn(app, email, 'a-good-long-password')).cookie).toContain('session');
  });

  it('lets facilitators invite members only', async () => {
    const facilitator = await signIn(app, DEMO.facilitator);
    const refused = await facilitator.json('/api/invitations', { method: 'POST', json: { email: 'boss@rungwise.example', role: 'admin' } });
    expect(refused.status).toBe(403);
    const ok = await facilitator.json('/api/invitations', { method: 'POST', json: { email: 'player9@rungwise.example' } });
    expect(ok).toMatchObject({ status: 201, body: { role: 'member' } });
  });

  it('withdraws an open invitation with a bodiless DELETE, and the link stops working', async () => {
    const email = 'withdrawn@rungwise.example';
    const { body } = await admin.json('/api/invitations', { method: 'POST', json: { email } });
    const mail = await waitForMail(admin, email, /invited/);
    const token = new URL(linkIn(mail, '/invitation?token=')).searchParams.get('token')!;
    expect((await admin.fetch(`/api/invitations/${body.id}`, { method: 'DELETE' })).status).toBe(204);
    const accept = await anonymous(app).json('/api/invitations/accept', { method: 'POST', json: { token, name: 'Too Late', password: 'a-good-long-password' } });
    expect(accept).toMatchObject({ status: 410, body: { error: 'This invitation was withdrawn' } });
  });

  it('refuses an invitation to an address that has an account', async () => {
    const { status, body } = await admin.json('/api/invitations', { method: 'POST', json: { email: DEMO.red } });
    expect(status).toBe(409);
    expect(body.fields[0]).toMatchObject({ field: 'email' });
  });
});

describe('platform: passwords, roles and deactivation', () => {
  it('resets a password through the e-mailed link', async () => {
    const requested = await anonymous(app).json('/api/auth/request-password-reset', {
      method: 'POST',
      json: { email: DEMO.mediator, redirectTo: '/reset-password' },
    });
    expect(requested.status).toBe(200);
    const mail = await waitForMail(admin, DEMO.mediator, /Reset your Rungwise password/);
    const token = new URL(linkIn(mail, '/reset-password?token=')).searchParams.get('token')!;
    const reset = await anonymous(app).json('/api/auth/reset-password', { method: 'POST', json: { token, newPassword: 'mediator-new-pass-1' } });
    expect(reset.status).toBe(200);
    await expect(signIn(app, DEMO.mediator)).rejects.toThrow(/401/);
    expect((await signIn(app, DEMO.mediator, 'mediator-new-pass-1')).cookie).toBeTruthy();
  });

  it('changes roles and deactivates accounts, ending their sessions', async () => {
    const { body } = await admin.json<{ users: { id: string; email: string }[] }>('/api/users');
    const sponsorId = body.users.find((u) => u.email === DEMO.sponsor)!.id;
    const sponsor = await signIn(app, DEMO.sponsor);

    expect((await admin.json(`/api/users/${sponsorId}`, { method: 'PATCH', json: { role: 'facilitator' } })).status).toBe(200);
    expect((await sponsor.json('/api/me')).body.user.role).toBe('facilitator');

    expect((await admin.json(`/api/users/${sponsorId}`, { method: 'PATCH', json: { active: false } })).status).toBe(200);
    expect((await sponsor.json('/api/me')).status).toBe(401);
    await expect(signIn(app, DEMO.sponsor)).rejects.toThrow();

    expect((await admin.json(`/api/users/${sponsorId}`, { method: 'PATCH', json: { active: true, role: 'member' } })).status).toBe(200);
    expect((await signIn(app, DEMO.sponsor)).cookie).toBeTruthy();
  });

  it('keeps at least one active administrator', async () => {
    const { body } = await admin.json<{ users: { id: string; email: string }[] }>('/api/users');
    const adminId = body.users.find((u) => u.email === DEMO.admin)!.id;
    const demote = await admin.json(`/api/users/${adminId}`, { method: 'PATCH', json: { role: 'member' } });
    expect(demote.status).toBe(409);
  });
});

describe('platform: signing out', () => {
  it('ends the session through the sign-out form post', async () => {
    const member = await signIn(app, DEMO.blue2);
    const out = await member.fetch('/sign-out', { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: '' });
    expect(out.status).toBe(303);
    expect(out.headers.get('location')).toBe('/sign-in');
    expect(out.headers.get('clear-site-data')).toBe('"storage"');
    expect((await member.json('/api/me')).status).toBe(401);
  });

  it('refuses a cross-site form post', async () => {
    const member = await signIn(app, DEMO.blue2);
    const forged = await member.fetch('/sign-out', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded', origin: 'https://elsewhere.example' },
      body: '',
    });
    expect(forged.status).toBe(403);
    expect((await member.json('/api/me')).status).toBe(200);
  });
});

describe('platform: websockets', () => {
  it('refuses an upgrade without a valid session with 401, before any socket opens', async () => {
    await expect(openSocket(app, '/ws/exercise/anything', '')).rejects.toMatchObject({ status: 401 });
    await expect(openSocket(app, '/ws/exercise/anything', 'better-auth.session_token=forged')).rejects.toMatchObject({ status: 401 });
  });

  it('refuses an unknown channel with 404 and a foreign origin with 403', async () => {
    const client = await signIn(app, DEMO.facilitator);
    await expect(client.socket('/ws/no-such-channel')).rejects.toMatchObject({ status: 404 });
    const foreign = new Promise((done, fail) => {
      import('ws').then(({ default: WebSocket }) => {
        const ws = new WebSocket(`ws://127.0.0.1:${app.port}/ws/no-such-channel`, { headers: { cookie: client.cookie, origin: 'https://elsewhere.example' } });
        ws.once('unexpected-response', (_q, res) => done(res.statusCode));
        ws.once('open', () => fail(new Error('opened')));
      });
    });
    expect(await foreign).toBe(403);
  });
});

describe('platform: rate limiting and shutdown', () => {
  it('limits sign-in attempts per client address', async () => {
    const strict = await startApp({ env: { RUNGWISE_SIGNIN_LIMIT: '10' } });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 12; i++) {
        const { status } = await anonymous(strict).json('/api/auth/sign-in/email', {
          method: 'POST',
          json: { email: DEMO.red, password: 'wrong-password-here' },
        });
        statuses.push(status);
      }
      expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true);
      expect(statuses.slice(10)).toEqual([429, 429]);
    } finally {
      await strict.stop();
    }
  });

  it('closes cleanly on SIGTERM and checkpoints the WAL', async () => {
    const other = await startApp({ seed: false });
    const socketClosed = new Promise<number>((done) => {
      openSocket(other, '/ws/none', '').catch(() => done(401));
    });
    expect(await socketClosed).toBe(401);
    expect(await other.terminate()).toBe(0);
    expect(existsSync(`${other.databasePath}-wal`)).toBe(false);
    expect(other.output()).toContain('SIGTERM');
    await other.stop();
  });
});
