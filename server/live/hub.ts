/**
 * The exercise hub: the authority for live exercises in this process. It keeps
 * the sockets of each exercise, turns client messages into commits (through
 * src/lib/exercise), acknowledges them, broadcasts numbered updates filtered
 * per viewer, resumes reconnecting clients from the last number they saw, and
 * runs the turn deadlines. One per process, created through shared().
 */
import type { WebSocket } from 'ws';
import { and, eq, gt } from 'drizzle-orm';
import { db, schema } from '../../src/db/client';
import type { SessionUser } from '../../src/lib/auth';
import { commitDeadline, commitIntent, type Committed } from '../../src/lib/exercise/commit';
import type { Audience } from '../../src/lib/exercise/commands';
import { parseClientMessage } from '../../src/lib/exercise/messages';
import type { ServerMessage } from '../../src/lib/exercise/protocol';
import { HUB, type Publisher } from '../../src/lib/exercise/publish';
import { inAudience, sections, snapshot, Source, type Viewer } from '../../src/lib/exercise/sections';
import { IntentError, type EventRow } from '../../src/lib/exercise/state';
import { viewerFor } from '../../src/lib/exercise/service';
import { SECTIONS, type EventSummary, type PresenceView, type SectionName, type Snapshot } from '../../src/lib/exercise/view';
import { shared } from '../../src/lib/runtime';
import { MESSAGE_DROPPED } from '../socket-guard';
import { provideAnalysis } from './analysis';

/** A client this far behind gets a whole snapshot instead of the changed sections. */
const RESUME_LIMIT = 500;
const HEARTBEAT_MS = 20_000;
/** A client that cannot keep up (this much unsent) is dropped; it resumes when it reconnects. */
const MAX_BUFFERED_BYTES = 4 * 1024 * 1024;

const RATE_LIMITED = new IntentError('rate-limited', 'This screen sent too many messages in a short time; this one was not read and nothing changed. Wait a moment and send it again.');

type Connection = {
  socket: WebSocket;
  user: SessionUser;
  exerciseId: string;
  viewer: Viewer | null;
  alive: boolean;
};

export class ExerciseHub implements Publisher {
  private rooms = new Map<string, Set<Connection>>();
  private deadlines = new Map<string, NodeJS.Timeout>();
  private heartbeat: NodeJS.Timeout | null = null;

  /** Arm the deadlines of every exercise whose clock runs (after a restart, too). */
  start(): void {
    provideAnalysis((versionId) => this.analysisReady(versionId));
    const running = db().select({ id: schema.exercise.id, clock: schema.exercise.clock }).from(schema.exercise).where(eq(schema.exercise.state, 'live')).all();
    for (const row of running) this.arm(row.id, row.clock);
    this.heartbeat ??= setInterval(() => this.beat(), HEARTBEAT_MS);
    this.heartbeat.unref();
  }

  stop(): void {
    for (const timer of this.deadlines.values()) clearTimeout(timer);
    this.deadlines.clear();
    if (this.heartbeat) clearInterval(this.heartbeat);
    this.heartbeat = null;
    for (const room of this.rooms.values()) for (const c of room) c.socket.terminate();
    this.rooms.clear();
  }

  connect(socket: WebSocket, user: SessionUser, exerciseId: string): void {
    const connection: Connection = { socket, user, exerciseId, viewer: null, alive: true };
    const room = this.rooms.get(exerciseId) ?? new Set();
    room.add(connection);
    this.rooms.set(exerciseId, room);
    socket.on('pong', () => (connection.alive = true));
    socket.on('message', (data, isBinary) => this.receive(connection, data as Buffer, isBinary));
    socket.on(MESSAGE_DROPPED, (data: Buffer, isBinary: boolean) => this.refuse(connection, isBinary ? null : keyOf(data), RATE_LIMITED));
    socket.on('close', () => this.leave(connection));
    socket.on('error', () => socket.terminate());
  }

  /** Broadcast a commit to everyone in the exercise who may see it, and re-arm its deadline. */
  publish(committed: Committed): void {
    this.arm(committed.exerciseId, committed.exercise.state === 'live' ? committed.exercise.clock : null);
    const room = this.rooms.get(committed.exerciseId);
    const change = committed.change;
    if (!room || room.size === 0 || !change) return;
    const source = new Source(committed.exerciseId);
    const event: EventSummary = { seq: committed.seq, kind: change.kind, actorName: committed.actorName, summary: change.summary, at: committed.at };
    const patches = new Map<string, Partial<Snapshot>>();
    for (const c of room) {
      if (!c.viewer) continue;
      if (change.sections === 'all') {
        if (this.refreshViewer(c)) this.send(c, { v: 1, type: 'snapshot', seq: committed.seq, serverNow: Date.now(), view: snapshot(source, c.viewer!) });
        continue;
      }
      if (!inAudience(source, c.viewer, change.audience)) continue;
      const key = viewKey(c.viewer);
      if (!patches.has(key)) patches.set(key, sections(source, c.viewer, change.sections.filter((n) => n !== 'me')));
      const patch = change.sections.includes('me') ? { ...patches.get(key), ...sections(source, c.viewer, ['me']) } : patches.get(key)!;
      this.send(c, { v: 1, type: 'update', seq: committed.seq, serverNow: Date.now(), event, patch });
    }
  }

  /**
   * A version's analysis is in: send it to every screen of an exercise on that version
   * that may read it, one exercise per turn of the event loop so intents are not held up.
   */
  analysisReady(versionId: string): void {
    const pending = [...this.rooms.keys()];
    const next = () => {
      const exerciseId = pending.shift();
      if (exerciseId === undefined) return;
      this.sendAnalysis(exerciseId, versionId);
      setImmediate(next);
    };
    next();
  }

  private sendAnalysis(exerciseId: string, versionId: string): void {
    const room = this.rooms.get(exerciseId);
    if (!room) return;
    const source = new Source(exerciseId);
    if (source.exercise.scenarioVersionId !== versionId) return;
    for (const c of room) {
      if (!c.viewer) continue;
      const { analysis } = sections(source, c.viewer, ['analysis']);
      if (analysis) this.send(c, { v: 1, type: 'analysis', analysis });
    }
  }

  // -------------------------------------------------------------------------

  private receive(c: Connection, data: Buffer, isBinary: boolean): void {
    try {
      const parsed = parseClientMessage(data, isBinary);
      if (!parsed.ok) return this.refuse(c, parsed.key, parsed.error);
      const message = parsed.message;
      if (message.type === 'ping') return this.send(c, { v: 1, type: 'pong', serverNow: Date.now() });
      if (message.type === 'hello') return this.hello(c, message.lastSeq);
      if (!c.viewer) return this.refuse(c, message.key, new IntentError('not-ready', 'Send hello first: the server has not shown you the exercise yet'));
      const committed = commitIntent(c.exerciseId, { id: c.user.id, name: c.viewer.name, role: c.user.role }, message.key, message.intent);
      this.send(c, { v: 1, type: 'ack', key: message.key, seq: committed.seq, duplicate: committed.duplicate, result: committed.result });
      if (!committed.duplicate) this.publish(committed);
    } catch (error) {
      const key = keyOf(data);
      if (error instanceof IntentError) return this.refuse(c, key, error);
      console.error('[live] message failed', error);
      this.refuse(c, key, new IntentError('server-error', 'The server could not handle this message; it was logged. Nothing was changed.'));
    }
  }

  private hello(c: Connection, lastSeq: number | null): void {
    if (!this.refreshViewer(c)) return;
    const source = new Source(c.exerciseId);
    const seq = source.exercise.seq;
    const viewer = c.viewer!;
    const resume = lastSeq !== null && lastSeq >= 1 && lastSeq <= seq ? this.missedSince(source, viewer, lastSeq) : null;
    if (!resume) this.send(c, { v: 1, type: 'snapshot', seq, serverNow: Date.now(), view: snapshot(source, viewer) });
    else this.send(c, { v: 1, type: 'resume', seq, from: lastSeq!, serverNow: Date.now(), missed: resume.missed, patch: sections(source, viewer, resume.names) });
    this.announcePresence(c.exerciseId);
  }

  /** What changed since `lastSeq` for this viewer: the sections to resend and the events it may see; null means "send a snapshot". */
  private missedSince(source: Source, viewer: Viewer, lastSeq: number): { names: SectionName[]; missed: EventSummary[] } | null {
    const events: EventRow[] = db()
      .select()
      .from(schema.exerciseEvent)
      .where(and(eq(schema.exerciseEvent.exerciseId, source.exerciseId), gt(schema.exerciseEvent.seq, lastSeq)))
      .orderBy(schema.exerciseEvent.seq)
      .limit(RESUME_LIMIT + 1)
      .all();
    if (events.length > RESUME_LIMIT || events.some((e) => e.sections.includes('all'))) return null;
    const visible = events.filter((e) => inAudience(source, viewer, e.data.audience as Audience | undefined));
    const names = new Set<SectionName>(['clock']);
    for (const e of visible) for (const name of e.sections) if (SECTIONS.includes(name as SectionName)) names.add(name as SectionName);
    return {
      names: [...names],
      missed: visible.map((e) => ({ seq: e.seq, kind: e.kind, actorName: e.actorName, summary: e.summary, at: e.createdAt.getTime() })),
    };
  }

  /** Re-read the connection's seat; a person taken off the roster is disconnected. */
  private refreshViewer(c: Connection): boolean {
    c.viewer = viewerFor(c.exerciseId, c.user);
    if (c.viewer) return true;
    this.send(c, { v: 1, type: 'error', key: null, code: 'forbidden', message: 'You are no longer part of this exercise', fields: [] });
    c.socket.close(4403, 'No longer part of this exercise');
    return false;
  }

  private refuse(c: Connection, key: string | null, error: IntentError): void {
    this.send(c, { v: 1, type: 'error', key, code: error.code, message: error.message, fields: error.fields });
  }

  private send(c: Connection, message: ServerMessage): void {
    if (c.socket.readyState !== c.socket.OPEN) return;
    if (c.socket.bufferedAmount > MAX_BUFFERED_BYTES) {
      c.socket.terminate();
      return;
    }
    c.socket.send(JSON.stringify(message));
  }

  private leave(c: Connection): void {
    const room = this.rooms.get(c.exerciseId);
    room?.delete(c);
    if (room?.size === 0) this.rooms.delete(c.exerciseId);
    else this.announcePresence(c.exerciseId);
  }

  private announcePresence(exerciseId: string): void {
    const room = this.rooms.get(exerciseId);
    if (!room) return;
    const seen = new Map<string, PresenceView['online'][number]>();
    for (const c of room) if (c.viewer) seen.set(c.user.id, { userId: c.user.id, name: c.viewer.name, teamId: c.viewer.seat.teamId, role: c.viewer.seat.role });
    const everyone = [...seen.values()];
    for (const c of room) {
      if (!c.viewer) continue;
      const { role, teamId } = c.viewer.seat;
      const online = role === 'facilitator' || role === 'observer' ? everyone : role === 'player' ? everyone.filter((p) => p.role === 'facilitator' || (p.role === 'player' && p.teamId === teamId)) : [];
      this.send(c, { v: 1, type: 'presence', presence: { online } });
    }
  }

  /** One timer per exercise, for its running clock's deadline. */
  private arm(exerciseId: string, clock: Committed['exercise']['clock']): void {
    clearTimeout(this.deadlines.get(exerciseId));
    this.deadlines.delete(exerciseId);
    if (!clock || clock.status !== 'running' || clock.deadlineAt === null) return;
    const timer = setTimeout(() => this.deadlinePassed(exerciseId), Math.max(0, clock.deadlineAt - Date.now()));
    timer.unref();
    this.deadlines.set(exerciseId, timer);
  }

  private deadlinePassed(exerciseId: string): void {
    this.deadlines.delete(exerciseId);
    try {
      const committed = commitDeadline(exerciseId);
      if (committed) this.publish(committed);
    } catch (error) {
      console.error(`[live] deadline of exercise ${exerciseId} failed`, error);
    }
  }

  private beat(): void {
    for (const room of this.rooms.values()) {
      for (const c of room) {
        if (!c.alive) {
          c.socket.terminate();
          continue;
        }
        c.alive = false;
        c.socket.ping();
      }
    }
  }
}

/** Viewers with the same seat kind and team see the same sections (the "me" section is per person). */
function viewKey(viewer: Viewer): string {
  return `${viewer.seat.role}:${viewer.seat.teamId ?? ''}`;
}

function keyOf(data: Buffer): string | null {
  try {
    const key = (JSON.parse(data.toString('utf8')) as { key?: unknown }).key;
    return typeof key === 'string' && key.length <= 64 ? key : null;
  } catch {
    return null;
  }
}

export function exerciseHub(): ExerciseHub {
  return shared(HUB, () => new ExerciseHub());
}
