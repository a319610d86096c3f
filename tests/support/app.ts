/**
 * Integration and e2e tests run the real built server as a child process on a
 * free port with its own temporary SQLite file, and talk HTTP and websockets
 * to it. Nothing is mocked.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import WebSocket from 'ws';
import { DEMO_PASSWORD, DEMO_PEOPLE, type DemoPerson } from '../../server/seed/people';

export { DEMO_PASSWORD };

export type App = {
  url: string;
  port: number;
  dir: string;
  databasePath: string;
  /** Everything the server printed so far. */
  output(): string;
  stop(): Promise<void>;
  /** SIGTERM and wait, keeping the folder (for a restart or a look at the files). */
  terminate(): Promise<number | null>;
  /** SIGKILL: no chance to checkpoint or close anything. */
  kill(): Promise<void>;
  /** Start the server again on the same port and database. */
  restart(): Promise<void>;
};

export type AppOptions = { seed?: boolean; env?: Record<string, string> };

export async function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const probe = createServer();
    probe.once('error', fail);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => done(port));
    });
  });
}

export async function startApp(options: AppOptions = {}): Promise<App> {
  const dir = mkdtempSync(join(tmpdir(), 'rungwise-test-'));
  const port = await freePort();
  const databasePath = join(dir, 'rungwise.db');
  let child: ChildProcess | null = null;
  let log = '';

  const launch = async () => {
    child = spawn(process.execPath, ['--import', 'tsx', resolve('server/index.ts')], {
      env: {
        ...process.env,
        NODE_ENV: 'production',
        PORT: String(port),
        HOST: '127.0.0.1',
        DATABASE_URL: databasePath,
        RUNGWISE_SIGNIN_LIMIT: '1000',
        RUNGWISE_SEED: options.seed === false ? 'off' : 'on',
        ...options.env,
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    child.stdout!.on('data', (chunk) => (log += chunk));
    child.stderr!.on('data', (chunk) => (log += chunk));
    await waitForHealth(`http://127.0.0.1:${port}`, () => log, child);
  };

  const exited = (signal: NodeJS.Signals) =>
    new Promise<number | null>((done) => {
      const running = child;
      if (!running || running.exitCode !== null || running.signalCode !== null) return done(running?.exitCode ?? null);
      running.once('exit', (code) => done(code));
      running.kill(signal);
    });

  await launch();
  return {
    url: `http://127.0.0.1:${port}`,
    port,
    dir,
    databasePath,
    output: () => log,
    async stop() {
      await exited('SIGTERM');
      rmSync(dir, { recursive: true, force: true });
    },
    terminate: () => exited('SIGTERM'),
    kill: async () => {
      await exited('SIGKILL');
    },
    restart: launch,
  };
}

async function waitForHealth(url: string, log: () => string, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The server exited early:\n${log()}`);
    try {
      const answer = await fetch(`${url}/api/health`);
      if (answer.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`The server did not become healthy in 60 s:\n${log()}`);
}

/** A signed-in HTTP client: keeps the session cookie and sends the Origin header a browser would. */
export type Client = {
  cookie: string;
  fetch(path: string, init?: RequestInit & { json?: unknown }): Promise<Response>;
  json<T = any>(path: string, init?: RequestInit & { json?: unknown }): Promise<{ status: number; body: T }>;
  socket(path: string): Promise<WebSocket>;
};

export function anonymous(app: App): Client {
  return clientWith(app, '');
}

export async function signIn(app: App, email: string, password = DEMO_PASSWORD): Promise<Client> {
  const answer = await fetch(`${app.url}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: app.url },
    body: JSON.stringify({ email, password }),
  });
  if (!answer.ok) throw new Error(`Sign-in of ${email} failed: ${answer.status} ${await answer.text()}`);
  const cookie = answer.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
  return clientWith(app, cookie);
}

function clientWith(app: App, cookie: string): Client {
  const doFetch = (path: string, init: RequestInit & { json?: unknown } = {}) => {
    const { json, headers, ...rest } = init;
    return fetch(`${app.url}${path}`, {
      ...rest,
      redirect: 'manual',
      headers: {
        origin: app.url,
        ...(cookie ? { cookie } : {}),
        ...(json === undefined ? {} : { 'content-type': 'application/json' }),
        ...(headers as Record<string, string>),
      },
      body: json === undefined ? rest.body : JSON.stringify(json),
    });
  };
  return {
    cookie,
    fetch: doFetch,
    async json(path, init) {
      const answer = await doFetch(path, init);
      const text = await answer.text();
      return { status: answer.status, body: text ? JSON.parse(text) : null };
    },
    socket: (path) => openSocket(app, path, cookie),
  };
}

/** Open a websocket; rejects with the HTTP status when the upgrade is refused. */
export function openSocket(app: App, path: string, cookie: string): Promise<WebSocket> {
  return new Promise((done, fail) => {
    const ws = new WebSocket(`ws://127.0.0.1:${app.port}${path}`, {
      headers: { ...(cookie ? { cookie } : {}), origin: app.url },
    });
    ws.once('open', () => done(ws));
    ws.once('unexpected-response', (_req, res) => fail(Object.assign(new Error(`upgrade refused: ${res.statusCode}`), { status: res.statusCode })));
    ws.once('error', fail);
  });
}

/** The demo accounts' e-mail addresses by person. */
export const DEMO = Object.fromEntries(Object.entries(DEMO_PEOPLE).map(([key, p]) => [key, p.email])) as Record<DemoPerson, string>;
