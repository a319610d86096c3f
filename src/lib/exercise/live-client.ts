/**
 * The browser side of the exercise socket. It says hello with the last update
 * number it saw, applies snapshots, numbered updates and resumes, keeps every
 * intent it sent until the server acknowledges it (resending it with the same
 * idempotency key after a reconnect), and reconnects by itself with backoff.
 * With a PendingStore the unacknowledged intents also outlive the page: a
 * reload (or a crash of the tab) sends them again, with the same keys, so a
 * move made while the line was down is neither lost nor counted twice.
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
  /** Intents kept from before a page reload that the server refused when they were sent again, in words. */
  refusedAfterReload: string[];
};

/** An intent sent and not yet acknowledged, as kept between page loads. */
export type SavedIntent = { key: string; intent: Intent };

/** Where unacknowledged intents are kept between page loads (sessionStorage in the browser, see pendingInSession). */
export type PendingStore = { load(): SavedIntent[]; save(intents: SavedIntent[]): void };

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
  state: LiveState = { connection: 'connecting', refusal: null, snapshot: null, seq: 0, presence: { online: [] }, pending: 0, clockOffset: 0, missed: [], reconnects: 0, refusedAfterReload: [] };
  private socket: WebSocket | null = null;
  private waiting = new Map<string, Waiting>();
  private listeners = new Set<(state: LiveState) => void>();
  private attempt = 0;
  private lastHeard = Date.now();
  private timers: ReturnType<typeof setTimeout>[] = [];
  private heartbeat: ReturnType<typeof setInterval> | null = null;
  private stopped = false;

  /**
   * `connect` opens the socket: the browser's WebSocket by default; tests and the benchmark hand in the ws package's.
   * `store` keeps unacknowledged intents between page loads; those it holds are sent again once the line is up.
   */
  constructor(
    private readonly exerciseId: string,
    initial: { seq: number; view: Snapshot } | null = null,
    private readonly connect: (exerciseId: string) => WebSocket = (id) => new WebSocket(socketUrl(id)),
    private readonly store: PendingStore | null = null,
  ) {
    if (initial) this.state = { ...this.state, snapshot: initial.view, seq: initial.seq };
    for (const { key, intent } of store?.load() ?? []) {
      const refused = (error: Error) => this.set({ refusedAfterReload: [...this.state.refusedAfterReload, `${INTENT_WORDS[intent.kind] ?? 'A change'}: ${error.message}`] });
      this.waiting.set(key, { intent, resolve: () => undefined, reject: refused });
    }
    this.state.pending = this.waiting.size;
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
      this.keep();
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
    this.keep();
    this.set({ pending: this.waiting.size });
    finish(waiting);
  }

  private keep(): void {
    this.store?.save([...this.waiting].map(([key, { intent }]) => ({ key, intent })));
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

/** What a kept intent was, for the message when it is refused after a reload. */
const INTENT_WORDS: Record<Intent['kind'], string> = {
  draft: 'A draft change',
  submit: 'A move',
  reveal: 'A reveal',
  adjudicate: 'An adjudication',
  chance: 'A chance draw',
  clock: 'A clock change',
  phase: 'A change of phase',
  inject: 'An inject',
  undo: 'An undo',
  note: 'A note',
  settings: 'A settings change',
};

/**
 * Unacknowledged intents in the tab's sessionStorage, one entry per person and exercise: they
 * survive a reload of the tab but not its closing, and never pass to someone else signing in there.
 * A store that cannot be read or written (storage full or switched off) keeps nothing and says so once.
 */
export function pendingInSession(userId: string, exerciseId: string): PendingStore {
  const name = `rungwise:unsent:${userId}:${exerciseId}`;
  return {
    load() {
      try {
        const kept = JSON.parse(sessionStorage.getItem(name) ?? '[]') as unknown;
        return Array.isArray(kept) ? kept.filter((k): k is SavedIntent => typeof k?.key === 'string' && typeof k?.intent?.kind === 'string') : [];
      } catch {
        return [];
      }
    },
    save(intents) {
      try {
        if (intents.length === 0) sessionStorage.removeItem(name);
        else sessionStorage.setItem(name, JSON.stringify(intents));
      } catch (error) {
        console.warn('[live] unsent intents cannot be kept over a reload', error);
      }
    },
  };
}

export function socketUrl(exerciseId: string): string {
  const scheme = location.protocol === 'https:' ? 'wss' : 'ws';
  return `${scheme}://${location.host}/ws/exercise/${encodeURIComponent(exerciseId)}`;
}
