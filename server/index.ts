/**
 * The production entry: one HTTP server that serves the built Astro app and
 * accepts websocket upgrades under /ws/, plus the background services.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import sirv from 'sirv';
import { CLIENT_IP_HEADER } from '../src/lib/auth';
import { loadConfig } from '../src/lib/config';
import { DEMO_PASSWORD, DEMO_PEOPLE } from './seed/people';
import { startServices } from './services';
import { attachSockets } from './sockets';
import { distDir } from './build';

type AstroHandler = (req: IncomingMessage, res: ServerResponse, next?: () => void) => Promise<void>;

export async function main(): Promise<void> {
  process.env.NODE_ENV ??= 'production';
  const config = loadConfig();
  const services = await startServices();
  const entry = pathToFileURL(resolve(distDir(), 'server/entry.mjs')).href;
  const { handler } = (await import(entry)) as { handler: AstroHandler };
  const assets = sirv(resolve(distDir(), 'client'), { etag: true, immutable: true, dev: false });

  const server = createServer((req, res) => {
    req.headers[CLIENT_IP_HEADER] = req.socket.remoteAddress ?? '';
    assets(req, res, () => {
      handler(req, res).catch((error) => {
        console.error('[http]', error);
        if (!res.headersSent) res.writeHead(500).end();
      });
    });
  });
  const sockets = attachSockets(server);

  await new Promise<void>((done) => server.listen(config.port, config.host, done));
  announce(config.publicUrl, services.mailSink?.url, services.seeded);

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`[rungwise] ${signal}: closing sockets and checkpointing the database`);
    await sockets.close();
    server.closeAllConnections();
    await new Promise((done) => server.close(done));
    await services.stop();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop('SIGTERM'));
  process.on('SIGINT', () => void stop('SIGINT'));
}

function announce(url: string, sink: string | undefined, seeded: boolean): void {
  const lines = [
    `Rungwise is running at ${url}`,
    sink ? `Mail goes to the built-in sink at ${sink}; read it on the Outbox page (admin).` : 'Mail goes to SMTP_URL.',
    seeded ? 'Demo data was seeded into the new database.' : '',
    `Demo sign-ins (password ${DEMO_PASSWORD}):`,
    ...Object.values(DEMO_PEOPLE).map((p) => `  ${p.email.padEnd(32)} ${p.name} (${p.role})`),
  ];
  console.log(lines.filter(Boolean).join('\n'));
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  main().catch((error) => {
    console.error(error);
    process.exit(1);
  });
}
