/**
 * One report document being edited: the y-websocket protocol (sync and
 * awareness messages of y-protocols) between the server's copy of the Yjs
 * document and every connected editor or reader.
 *
 * Every update is stored in SQLite before it is passed on. Readers receive the
 * document and others' carets but their own document updates are dropped.
 * Awareness states carry the signed-in name, whatever the client claims.
 * An editor's update dropped by the message limit (server/socket-guard.ts) is
 * asked for again: a second later the room sends that peer sync step 1, which
 * y-websocket answers with everything the server's copy lacks.
 */
import * as decoding from 'lib0/decoding';
import * as encoding from 'lib0/encoding';
import * as awarenessProtocol from 'y-protocols/awareness';
import * as syncProtocol from 'y-protocols/sync';
import type { WebSocket } from 'ws';
import * as Y from 'yjs';
import type { SessionUser } from '../../src/lib/auth';
import { appendUpdate, compact, loadInto } from '../../src/lib/report/store';
import { MESSAGE_DROPPED } from '../socket-guard';

export const MESSAGE_SYNC = 0;
export const MESSAGE_AWARENESS = 1;
export const MESSAGE_QUERY_AWARENESS = 3;

/** Merge the stored rows after this many new updates, and when the last peer leaves. */
export const COMPACT_EVERY = 500;
const PING_MS = 30_000;
const RESYNC_AFTER_DROP_MS = 1000;

export type PeerMode = 'edit' | 'read';

type Peer = { socket: WebSocket; user: SessionUser; mode: PeerMode; clients: Set<number>; alive: boolean; resync: NodeJS.Timeout | null };

type AwarenessChange = { added: number[]; updated: number[]; removed: number[] };

export class ReportRoom {
  readonly doc: Y.Doc;
  readonly awareness: awarenessProtocol.Awareness;
  private readonly peers = new Map<WebSocket, Peer>();
  private sinceCompaction = 0;

  constructor(
    readonly exerciseId: string,
    private readonly onEmpty: (room: ReportRoom) => void,
  ) {
    this.doc = loadInto(exerciseId);
    this.awareness = new awarenessProtocol.Awareness(this.doc);
    this.awareness.setLocalState(null);
    this.doc.on('update', (update: Uint8Array, origin: unknown) => this.storeAndForward(update, origin));
    this.awareness.on('update', (change: AwarenessChange, origin: unknown) => this.forwardAwareness(change, origin));
  }

  get size(): number {
    return this.peers.size;
  }

  modeOf(socket: WebSocket): PeerMode | null {
    return this.peers.get(socket)?.mode ?? null;
  }

  join(socket: WebSocket, user: SessionUser, mode: PeerMode): void {
    const peer: Peer = { socket, user, mode, clients: new Set(), alive: true, resync: null };
    this.peers.set(socket, peer);
    socket.binaryType = 'nodebuffer';
    socket.on('message', (data: Buffer, isBinary: boolean) => {
      if (!isBinary) return this.drop(peer, 'Text frames are not part of this protocol');
      try {
        this.receive(peer, new Uint8Array(data.buffer, data.byteOffset, data.byteLength));
      } catch (error) {
        console.error(`[report] message from ${user.email} on ${this.exerciseId} refused`, error);
        this.drop(peer, 'Malformed message');
      }
    });
    socket.on(MESSAGE_DROPPED, () => this.resyncLater(peer));
    socket.on('pong', () => (peer.alive = true));
    const ping = setInterval(() => {
      if (!peer.alive) return socket.terminate();
      peer.alive = false;
      socket.ping();
    }, PING_MS);
    socket.on('close', () => {
      clearInterval(ping);
      clearTimeout(peer.resync ?? undefined);
      this.leave(peer);
    });
    this.greet(peer);
  }

  private greet(peer: Peer): void {
    this.sendSyncStep1(peer);
    const states = [...this.awareness.getStates().keys()];
    if (states.length > 0) this.send(peer, awarenessMessage(this.awareness, states));
  }

  /** Sync step 1 carries the server's state vector; the client answers with what is missing from it. */
  private sendSyncStep1(peer: Peer): void {
    const sync = encoding.createEncoder();
    encoding.writeVarUint(sync, MESSAGE_SYNC);
    syncProtocol.writeSyncStep1(sync, this.doc);
    this.send(peer, encoding.toUint8Array(sync));
  }

  /** A dropped message may have been a document update: ask the editor for what is missing, once the flood has passed. */
  private resyncLater(peer: Peer): void {
    if (peer.mode !== 'edit' || peer.resync) return;
    peer.resync = setTimeout(() => {
      peer.resync = null;
      this.sendSyncStep1(peer);
    }, RESYNC_AFTER_DROP_MS);
  }

  private receive(peer: Peer, message: Uint8Array): void {
    const decoder = decoding.createDecoder(message);
    const type = decoding.readVarUint(decoder);
    if (type === MESSAGE_SYNC) {
      if (peer.mode === 'read' && decoding.peekVarUint(decoder) !== syncProtocol.messageYjsSyncStep1) return;
      const reply = encoding.createEncoder();
      encoding.writeVarUint(reply, MESSAGE_SYNC);
      syncProtocol.readSyncMessage(decoder, reply, this.doc, peer);
      if (encoding.length(reply) > 1) this.send(peer, encoding.toUint8Array(reply));
    } else if (type === MESSAGE_AWARENESS) {
      awarenessProtocol.applyAwarenessUpdate(this.awareness, decoding.readVarUint8Array(decoder), peer);
    } else if (type === MESSAGE_QUERY_AWARENESS) {
      this.send(peer, awarenessMessage(this.awareness, [...this.awareness.getStates().keys()]));
    } else {
      throw new Error(`unknown message type ${type}`);
    }
  }

  /** Commit first, then pass the update to everyone but its sender. */
  private storeAndForward(update: Uint8Array, origin: unknown): void {
    appendUpdate(this.exerciseId, update);
    if (++this.sinceCompaction >= COMPACT_EVERY) this.compact();
    const encoder = encoding.createEncoder();
    encoding.writeVarUint(encoder, MESSAGE_SYNC);
    syncProtocol.writeUpdate(encoder, update);
    const message = encoding.toUint8Array(encoder);
    for (const peer of this.peers.values()) if (peer !== origin) this.send(peer, message);
  }

  private forwardAwareness({ added, updated, removed }: AwarenessChange, origin: unknown): void {
    const sender = origin && typeof origin === 'object' && this.peers.get((origin as Peer).socket) === origin ? (origin as Peer) : null;
    if (sender) {
      for (const id of [...added, ...updated]) {
        sender.clients.add(id);
        const state = this.awareness.getStates().get(id) as { user?: Record<string, unknown> } | undefined;
        if (state) state.user = { ...(state.user ?? {}), name: sender.user.name, mode: sender.mode };
      }
      for (const id of removed) sender.clients.delete(id);
    }
    const changed = [...added, ...updated, ...removed];
    if (changed.length === 0) return;
    const message = awarenessMessage(this.awareness, changed);
    for (const peer of this.peers.values()) this.send(peer, message);
  }

  private send(peer: Peer, message: Uint8Array): void {
    if (peer.socket.readyState !== peer.socket.OPEN) return;
    peer.socket.send(message, (error) => {
      if (error) peer.socket.terminate();
    });
  }

  /** 4400-4499 tells the y-websocket client not to reconnect. */
  private drop(peer: Peer, reason: string): void {
    peer.socket.close(4400, reason);
  }

  private leave(peer: Peer): void {
    if (!this.peers.delete(peer.socket)) return;
    if (peer.clients.size > 0) awarenessProtocol.removeAwarenessStates(this.awareness, [...peer.clients], null);
    if (this.peers.size === 0) this.onEmpty(this);
  }

  compact(): void {
    this.sinceCompaction = 0;
    try {
      compact(this.exerciseId);
    } catch (error) {
      // Every update is stored already; a failed merge only leaves more rows to read.
      console.error(`[report] compaction of ${this.exerciseId} failed`, error);
    }
  }

  destroy(): void {
    this.awareness.destroy();
    this.doc.destroy();
  }
}

function awarenessMessage(awareness: awarenessProtocol.Awareness, clients: number[]): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, MESSAGE_AWARENESS);
  encoding.writeVarUint8Array(encoder, awarenessProtocol.encodeAwarenessUpdate(awareness, clients));
  return encoding.toUint8Array(encoder);
}
