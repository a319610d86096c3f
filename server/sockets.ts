/**
 * Websocket endpoints under /ws/. Every upgrade is checked before a socket
 * opens: a valid session cookie (else 401), a trusted Origin (else 403), a
 * known route (else 404) and the route's own access check (403 with reason).
 * Each feature adds its route to ROUTES.
 *
 * Every open socket's messages pass server/socket-guard.ts (the route's
 * message limit; nothing once the server closes it); one person may hold
 * MAX_SOCKETS_PER_PERSON open at once (one more is closed with 4429, so that
 * opening connection after connection does not get round the message limit,
 * nor hold the server's memory); and every open socket
 * stays known here, so an access change (src/lib/access-changes.ts)
 * closes it at once: a deactivated account's sockets, and those opened with a
 * session that has signed out, with 4401, a socket whose
 * route no longer admits the person with 4403 and the access rule's reason.
 */
import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { WebSocketServer, type WebSocket } from 'ws';
import type { Decision } from '../src/lib/access';
import { onAccessChange, type AccessChange } from '../src/lib/access-changes';
import { sessionFromHeaders, type SessionUser } from '../src/lib/auth';
import { loadConfig } from '../src/lib/config';
import { exerciseRoute } from './live/route';
import { reportRoute } from './report/route';
import { closeSocket, guardMessages, MAX_SOCKETS_PER_PERSON, type MessageLimit } from './socket-guard';

export type SocketContext = { user: SessionUser; sessionId: string; params: Record<string, string>; request: IncomingMessage };

export type SocketRoute = {
  /** Path pattern with named groups, e.g. /^\/ws\/exercise\/(?<id>[\w-]+)$/ */
  pattern: RegExp;
  /** Messages one connection may send: a burst, then so many a second. */
  limit: MessageLimit;
  admit(user: SessionUser, params: Record<string, string>): Decision | Promise<Decision>;
  /** The exercise the channel belongs to: seat and settings changes there re-check its sockets. */
  exerciseOf(params: Record<string, string>): string;
  /** May this open socket stay after an access change? Without it, `admit` is asked again. */
  recheck?(socket: WebSocket, ctx: SocketContext): Decision | Promise<Decision>;
  open(socket: WebSocket, ctx: SocketContext): void;
};

/** Close codes 4400-4499 tell our clients (and y-websocket's) not to reconnect. */
export const CLOSE_SIGNED_OUT = 4401;
export const CLOSE_REFUSED = 4403;
export const CLOSE_TOO_MANY = 4429;

type OpenSocket = { socket: WebSocket; route: SocketRoute; ctx: SocketContext };

const ROUTES: SocketRoute[] = [exerciseRoute, reportRoute];

export const MAX_MESSAGE_BYTES = 1 << 20;

export type SocketsHandle = { close(): Promise<void> };

export function attachSockets(server: Server): SocketsHandle {
  const wss = new WebSocketServer({ noServer: true, maxPayload: MAX_MESSAGE_BYTES });
  const { socketLimits } = loadConfig();
  const open = new Set<OpenSocket>();
  const stopListening = onAccessChange((change) => revisit(open, change));
  server.on('upgrade', (request: IncomingMessage, socket: Duplex, head: Buffer) => {
    const path = new URL(request.url ?? '/', 'http://localhost').pathname;
    if (!path.startsWith('/ws/')) return; // someone else's upgrade (the dev server's HMR)
    admit(request, path)
      .then((admitted) => {
        if ('refusal' in admitted) return refuse(socket, admitted.refusal.status, admitted.refusal.reason);
        wss.handleUpgrade(request, socket, head, (ws) => {
          // Opened and closed at once rather than refused: a browser sees a close reason, never an upgrade's answer.
          if (socketLimits && openBy(open, admitted.ctx.user.id) >= MAX_SOCKETS_PER_PERSON) {
            return closeSocket(ws, CLOSE_TOO_MANY, `Too many live connections: at most ${MAX_SOCKETS_PER_PERSON} at once for one person. Close some tabs, then reload.`);
          }
          const entry: OpenSocket = { socket: ws, ...admitted };
          guardMessages(ws, socketLimits ? admitted.route.limit : null);
          open.add(entry);
          ws.once('close', () => open.delete(entry));
          admitted.route.open(ws, admitted.ctx);
        });
      })
      .catch((error) => {
        console.error('[ws] upgrade failed', error);
        refuse(socket, 500, 'Server error');
      });
  });
  return {
    close: () =>
      new Promise((resolve) => {
        stopListening();
        for (const client of wss.clients) client.close(1001, 'Server is shutting down');
        wss.close(() => resolve());
      }),
  };
}

function openBy(open: Set<OpenSocket>, userId: string): number {
  let n = 0;
  for (const entry of open) if (entry.ctx.user.id === userId) n++;
  return n;
}

/** Close the sockets an access change concerns, or ask their routes again. */
function revisit(open: Set<OpenSocket>, change: AccessChange): void {
  for (const entry of open) {
    if (change.kind === 'account-closed') {
      if (entry.ctx.user.id === change.userId) closeSocket(entry.socket, CLOSE_SIGNED_OUT, change.reason);
    } else if (change.kind === 'session-ended') {
      if (entry.ctx.sessionId === change.sessionId) closeSocket(entry.socket, CLOSE_SIGNED_OUT, change.reason);
    } else if (entry.route.exerciseOf(entry.ctx.params) === change.exerciseId && (change.userId === null || change.userId === entry.ctx.user.id)) {
      void recheck(entry);
    }
  }
}

async function recheck({ socket, route, ctx }: OpenSocket): Promise<void> {
  try {
    const decision = await (route.recheck ? route.recheck(socket, ctx) : route.admit(ctx.user, ctx.params));
    if (!decision.ok) closeSocket(socket, CLOSE_REFUSED, decision.reason);
  } catch (error) {
    console.error('[ws] access re-check failed', error);
    closeSocket(socket, 1011, 'Server error');
  }
}

type Admission =
  | { route: SocketRoute; ctx: SocketContext }
  | { refusal: { status: number; reason: string } };

async function admit(request: IncomingMessage, path: string): Promise<Admission> {
  const signedIn = await sessionFromHeaders(headersOf(request));
  if (!signedIn) return { refusal: { status: 401, reason: 'Sign in first' } };
  const { user, sessionId } = signedIn;
  if (!trustedOrigin(request.headers.origin)) return { refusal: { status: 403, reason: 'Untrusted origin' } };
  for (const route of ROUTES) {
    const match = route.pattern.exec(path);
    if (!match) continue;
    const params = { ...match.groups };
    const decision = await route.admit(user, params);
    if (!decision.ok) return { refusal: { status: decision.status, reason: decision.reason } };
    return { route, ctx: { user, sessionId, params, request } };
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
