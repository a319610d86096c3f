/**
 * The browser side of the exercise socket. It says hello with the last update
 * number it saw, applies snapshots, numbered updates and resumes, keeps every
 * intent it sent until the server acknowledges it (resending it with the same
 * idempotency key after a reconnect), and reconnects by itself with backoff.
 * Plain TypeScript; the React hook sits on top of it.
 */
import { PROTOCOL_VERSION, type ErrorCode, type FieldReason, type Intent, type ServerMessage } from './protocol';
import type { EventSummary, LogEntry, PresenceView, Snapshot } from './view';

export type Connection = 'connecting' | 'open' | 'reconnecting' | 'refused';

export type LiveState = {
  connection: Connection;
  /** Why the server refused us, when connection is "refused". */
  refusal: string | null;
  snapshot: Snapshot | null;
  seq: number;
  presence: PresenceView;
  /** Intents sent and not yet acknowledged. */
  pending: number;
  /** Server time minus local time, for countdowns. */
  clockOffset: number;
  /** Events that came in while this client was away, from the last resume. */
  missed: EventSummary[];
  /** Reconnects so far (for the status line). */
  reconnects: number;
};

export class IntentRefused extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields: FieldReason[],
  ) {
    super(message);
  }
}

type Waiting = { intent: Intent; resolve(result: Record<string, unknown>): void; reject(error: Error): void };

/** WebSocket.OPEN, spelled out so the class runs where no global WebSocket exists. */
const OPEN = 1;
const HEARTBEAT_MS = 10_000;
const SILENCE_MS = 25_000;
const LOG_KEEP = 300;

/** 4400-4499 (signed out, no longer seated) and 1008 (flooding) are refusals: reconnecting cannot help. */
const closedForGood = (code: number) => (code >= 4400 && code < 4500) || code === 1008;

export class LiveClient {
  state: LiveState = { connection: 'connecting', refusal: null, snapshot: null, seq: 0, presence: { online: [] }, pending: 0, clockOffset: 0, missed: [], reconnects: 0 };
  private socket: WebSocket | null = null;
  private waiting = new Map<string, Waiting>();
  private listeners = new Set<(state: LiveState) => void>();
  private attempt = 0;
  private lastHeard = Date.now();
  private timers: ReturnType<typeof setTimeout>[] = [];
  private heartbeat: ReturnType<typeof setInterval> | null = null;
  private stopped = false;

  /** `connect` opens the socket: the browser's WebSocket by default; tests and the benchmark hand in the ws package's. */
  constructor(
    private readonly exerciseId: string,
    initial: { seq: number; view: Snapshot } | null = null,
    private readonly connect: (exerciseId: string) => WebSocket = (id) => new WebSocket(socketUrl(id)),
  ) {
    if (initial) this.state = { ...this.state, snapshot: initial.view, seq: initial.seq };
  }

  subscribe(listener: (state: LiveState) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  start(): void {
    this.stopped = false;
    this.open();
    this.heartbeat = setInterval(() => this.checkLine(), HEARTBEAT_MS);
    if (typeof window !== 'undefined') window.addEventListener('online', this.reconnectNow);
  }

  stop(): void {
    this.stopped = true;
    if (this.heartbeat) clearInterval(this.heartbeat);
    this.timers.forEach(clearTimeout);
    if (typeof window !== 'undefined') window.removeEventListener('online', this.reconnectNow);
    this.socket?.close(1000, 'Leaving');
  }

  /** Send an intent; resolves with the server's result once it is committed, rejects with its refusal. */
  send(intent: Intent): Promise<Record<string, unknown>> {
    const key = crypto.randomUUID();
    return new Promise((resolve, reject) => {
      this.waiting.set(key, { intent, resolve, reject });
      this.set({ pending: this.waiting.size });
      if (this.ready()) this.transmit(key, intent);
    });
  }

  private ready(): boolean {
    return this.socket?.readyState === OPEN && this.state.connection === 'open';
  }

  private transmit(key: string, intent: Intent): void {
    this.socket!.send(JSON.stringify({ v: PROTOCOL_VERSION, type: 'intent', key, intent }));
  }

  private open(): void {
    const socket = this.connect(this.exerciseId);
    this.socket = socket;
    socket.onopen = () => {
      this.lastHeard = Date.now();
      socket.send(JSON.stringify({ v: PROTOCOL_VERSION, type: 'hello', lastSeq: this.state.snapshot ? this.state.seq : null }));
    };
    socket.onmessage = (event) => {
      this.lastHeard = Date.now();
      this.receive(JSON.parse(String(event.data)) as ServerMessage);
    };
    socket.onclose = (event) => {
      if (this.socket !== socket) return;
      this.socket = null;
      if (this.stopped) return;
      if (closedForGood(event.code)) {
        this.set({ connection: 'refused', refusal: event.reason || 'The server closed the connection' });
        return;
      }
      this.set({ connection: 'reconnecting' });
      this.later(() => this.open(), this.backoff());
    };
  }

  private backoff(): number {
    this.attempt += 1;
    return Math.min(5000, 250 * 2 ** Math.min(this.attempt, 5)) * (0.75 + Math.random() / 2);
  }

  private reconnectNow = () => {
    if (this.state.connection === 'reconnecting' && !this.socket) this.open();
  };

  private checkLine(): void {
    if (!this.socket || this.socket.readyState !== OPEN) return;
    if (Date.now() - this.lastHeard > SILENCE_MS) {
      this.socket.close(4000, 'No answer from the server');
      return;
    }
    this.socket.send(JSON.stringify({ v: PROTOCOL_VERSION, type: 'ping' }));
  }

  private receive(message: ServerMessage): void {
    if ('serverNow' in message) this.state.clockOffset = message.serverNow - Date.now();
    switch (message.type) {
      case 'snapshot':
        this.joined({ snapshot: message.view, seq: message.seq, missed: [] });
        break;
      case 'resume':
        this.joined({ snapshot: merge(this.state.snapshot!, message.patch, message.missed), seq: message.seq, missed: message.missed });
        break;
      case 'update':
        if (message.seq <= this.state.seq || !this.state.snapshot) break;
        this.set({ snapshot: merge(this.state.snapshot, message.patch, [message.event]), seq: message.seq });
        break;
      case 'ack':
        this.settle(message.key, (w) => w.resolve(message.result));
        break;
      case 'error':
        if (message.key && this.waiting.has(message.key)) this.settle(message.key, (w) => w.reject(new IntentRefused(message.code, message.message, message.fields)));
        else if (message.code === 'forbidden' && !this.state.snapshot) this.set({ connection: 'refused', refusal: message.message });
        break;
      case 'presence':
        this.set({ presence: message.presence });
        break;
      case 'analysis':
        if (this.state.snapshot) this.set({ snapshot: { ...this.state.snapshot, analysis: message.analysis } });
        break;
      case 'pong':
        break;
    }
  }

  /** After a snapshot or resume: the line is up; resend what was not acknowledged, in order. */
  private joined(next: Pick<LiveState, 'snapshot' | 'seq' | 'missed'>): void {
    const reconnected = this.attempt > 0;
    this.attempt = 0;
    this.set({ ...next, connection: 'open', refusal: null, reconnects: this.state.reconnects + (reconnected ? 1 : 0) });
    for (const [key, w] of this.waiting) this.transmit(key, w.intent);
  }

  private settle(key: string, finish: (w: Waiting) => void): void {
    const waiting = this.waiting.get(key);
    if (!waiting) return;
    this.waiting.delete(key);
    finish(waiting);
    this.set({ pending: this.waiting.size });
  }

  private later(run: () => void, ms: number): void {
    this.timers.push(setTimeout(run, ms));
  }

  private set(patch: Partial<LiveState>): void {
    this.state = { ...this.state, ...patch };
    for (const listener of this.listeners) listener(this.state);
  }
}

/** Apply a patch of sections; new events join the facilitator's log. */
function merge(snapshot: Snapshot, patch: Partial<Snapshot>, events: EventSummary[]): Snapshot {
  const next = { ...snapshot, ...patch };
  if (next.log && !patch.log) {
    const known = new Set(next.log.map((e) => e.seq));
    const fresh: LogEntry[] = events.filter((e) => e.kind !== 'draft' && !known.has(e.seq));
    next.log = [...next.log, ...fresh].slice(-LOG_KEEP);
  }
  return next;
}

export function socketUrl(exerciseId: string): string {
  const scheme = location.protocol === 'https:' ? 'wss' : 'ws';
  return `${scheme}://${location.host}/ws/exercise/${encodeURIComponent(exerciseId)}`;
}
