/**
 * What stands between a socket and its route's 'message' listeners: nothing is
 * delivered once the server has begun to close the socket, and each
 * connection has a limit on the messages it may send, a token bucket of
 * `burst` messages refilled at `perSecond`. A message over the limit is not
 * delivered: the socket emits MESSAGE_DROPPED instead of 'message' (a route
 * answers it if its protocol has an error message). A connection with
 * CLOSE_AFTER_DROPS messages dropped since its bucket was last full keeps
 * flooding and is closed with 1008.
 */
import type { WebSocket } from 'ws';

export type MessageLimit = { burst: number; perSecond: number };

export type Verdict = 'deliver' | 'drop' | 'close';

export const MESSAGE_DROPPED = 'message-dropped';
export const CLOSE_AFTER_DROPS = 50;
/** Sockets one person may hold open (server/sockets.ts closes one more with 4429). A tab holds one or two: an exercise, its report; this leaves room for a facilitator's many tabs. */
export const MAX_SOCKETS_PER_PERSON = 32;
/** A client that does not finish the closing handshake is cut off after this. */
const CLOSE_GRACE_MS = 2000;

export class TokenBucket {
  private tokens: number;
  private dropped = 0;

  constructor(
    private readonly limit: MessageLimit,
    private at = performance.now(),
  ) {
    this.tokens = limit.burst;
  }

  take(now = performance.now()): Verdict {
    this.tokens = Math.min(this.limit.burst, this.tokens + (Math.max(0, now - this.at) / 1000) * this.limit.perSecond);
    this.at = now;
    if (this.tokens === this.limit.burst) this.dropped = 0;
    if (this.tokens >= 1) {
      this.tokens -= 1;
      return 'deliver';
    }
    this.dropped += 1;
    return this.dropped >= CLOSE_AFTER_DROPS ? 'close' : 'drop';
  }
}

/** Wrap the socket's message delivery, under every 'message' listener a route adds; no limit when `limit` is null. */
export function guardMessages(socket: WebSocket, limit: MessageLimit | null): void {
  const bucket = limit ? new TokenBucket(limit) : null;
  const emit = socket.emit.bind(socket);
  socket.emit = ((event: string | symbol, ...args: unknown[]) => {
    if (event !== 'message') return emit(event, ...args);
    if (socket.readyState !== socket.OPEN) return false;
    const verdict = bucket?.take() ?? 'deliver';
    if (verdict === 'deliver') return emit('message', ...args);
    if (verdict === 'drop') return emit(MESSAGE_DROPPED, ...args);
    closeSocket(socket, 1008, `Too many messages: at most ${limit!.perSecond} a second after a burst of ${limit!.burst}`);
    return false;
  }) as WebSocket['emit'];
}

/** Close with a code and reason (cut to the 123 bytes a close frame holds); terminate if the client does not answer. */
export function closeSocket(socket: WebSocket, code: number, reason: string): void {
  if (socket.readyState === socket.CLOSED) return;
  let text = reason;
  while (Buffer.byteLength(text) > 123) text = text.slice(0, -1);
  socket.close(code, text);
  const cutOff = setTimeout(() => socket.terminate(), CLOSE_GRACE_MS);
  cutOff.unref();
  socket.once('close', () => clearTimeout(cutOff));
}
