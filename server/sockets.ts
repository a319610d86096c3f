/**
 * Websocket endpoints under /ws/. Every upgrade is checked before a socket
 * opens: a valid session cookie (else 401), a trusted Origin (else 403), a
 * known route (else 404) and the route's own access check (403 with reason).
 * Each feature adds its route to ROUTES.
 */
import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { WebSocketServer, type WebSocket } from 'ws';
import type { Decision } from '../src/lib/access';
import { userFromHeaders, type SessionUser } from '../src/lib/auth';
import { loadConfig } from '../src/lib/config';
import { exerciseRoute } from './live/route';
import { reportRoute } from './report/route';

export type SocketContext = { user: SessionUser; params: Record<string, string>; request: IncomingMessage };

export type SocketRoute = {
  /** Path pattern with named groups, e.g. /^\/ws\/exercise\/(?<id>[\w-]+)$/ */
  pattern: RegExp;
  admit(user: SessionUser, params: Record<string, string>): Decision | Promise<Decision>;
  open(socket: WebSocket, ctx: SocketContext): void;
};

const ROUTES: SocketRoute[] = [exerciseRoute, reportRoute];

export const MAX_MESSAGE_BYTES = 1 << 20;

export type SocketsHandle = { close(): Promise<void> };

export function attachSockets(server: Server): SocketsHandle {
  const wss = new WebSocketServer({ noServer: true, maxPayload: MAX_MESSAGE_BYTES });
  server.on('upgrade', (request: IncomingMessage, socket: Duplex, head: Buffer) => {
    const path = new URL(request.url ?? '/', 'http://localhost').pathname;
    if (!path.startsWith('/ws/')) return; // someone else's upgrade (the dev server's HMR)
    admit(request, path)
      .then((admitted) => {
        if ('refusal' in admitted) return refuse(socket, admitted.refusal.status, admitted.refusal.reason);
        wss.handleUpgrade(request, socket, head, (ws) => admitted.route.open(ws, admitted.ctx));
      })
      .catch((error) => {
        console.error('[ws] upgrade failed', error);
        refuse(socket, 500, 'Server error');
      });
  });
  return {
    close: () =>
      new Promise((resolve) => {
        for (const client of wss.clients) client.close(1001, 'Server is shutting down');
        wss.close(() => resolve());
      }),
  };
}

type Admission =
  | { route: SocketRoute; ctx: SocketContext }
  | { refusal: { status: number; reason: string } };

async function admit(request: IncomingMessage, path: string): Promise<Admission> {
  const user = await userFromHeaders(headersOf(request));
  if (!user) return { refusal: { status: 401, reason: 'Sign in first' } };
  if (!trustedOrigin(request.headers.origin)) return { refusal: { status: 403, reason: 'Untrusted origin' } };
  for (const route of ROUTES) {
    const match = route.pattern.exec(path);
    if (!match) continue;
    const params = { ...match.groups };
    const decision = await route.admit(user, params);
    if (!decision.ok) return { refusal: { status: decision.status, reason: decision.reason } };
    return { route, ctx: { user, params, request } };
  }
  return { refusal: { status: 404, reason: 'No such live channel' } };
}

/** Browsers always send Origin on websocket upgrades; other clients may omit it. */
function trustedOrigin(origin: string | undefined): boolean {
  if (!origin) return true;
  const { port, publicUrl } = loadConfig();
  const url = new URL(origin);
  const loopback = ['localhost', '127.0.0.1', '[::1]'].includes(url.hostname) && url.port === String(port);
  return loopback || url.origin === new URL(publicUrl).origin;
}

function headersOf(request: IncomingMessage): Headers {
  const headers = new Headers();
  for (const [name, value] of Object.entries(request.headers)) {
    if (typeof value === 'string') headers.set(name, value);
    else if (Array.isArray(value)) headers.set(name, value.join(', '));
  }
  return headers;
}

const REASONS: Record<number, string> = { 401: 'Unauthorized', 403: 'Forbidden', 404: 'Not Found', 500: 'Internal Server Error' };

function refuse(socket: Duplex, status: number, reason: string): void {
  const body = JSON.stringify({ error: reason });
  socket.end(
    `HTTP/1.1 ${status} ${REASONS[status] ?? 'Error'}\r\nContent-Type: application/json\r\nContent-Length: ${Buffer.byteLength(body)}\r\nConnection: close\r\n\r\n${body}`,
  );
}
