/**
 * /ws/report/<exerciseId>: the y-websocket endpoint of an exercise's report.
 * Editors (report.edit) join read-write; those who may read the draft
 * (report.readDraft, e.g. players allowed to comment) join read-only; everyone
 * else is refused before the socket opens, with the access rule's reason.
 * After a seat or settings change an open socket whose mode is no longer the
 * one it joined with is closed (server/sockets.ts asks `recheck`).
 */
import { decide, type Decision } from '../../src/lib/access';
import { HttpError } from '../../src/lib/http';
import { ensureReportDraft } from '../../src/lib/report/draft-store';
import { exerciseAccess } from '../../src/lib/report/exercise';
import type { SocketRoute } from '../sockets';
import type { PeerMode } from './room';
import { joinReport, modeOf } from './rooms';

function modeFor(user: Parameters<SocketRoute['admit']>[0], exerciseId: string): PeerMode | Decision {
  let access;
  try {
    access = exerciseAccess(user.id, exerciseId);
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) return { ok: false, status: 403, reason: 'You are not part of this exercise' };
    throw error;
  }
  if (decide(user, 'report.edit', access.ctx).ok) return 'edit';
  const read = decide(user, 'report.readDraft', access.ctx);
  return read.ok ? 'read' : read;
}

export const reportRoute: SocketRoute = {
  pattern: /^\/ws\/report\/(?<exerciseId>[\w-]+)$/,
  /**
   * The editor sends two messages a keystroke (the update and the caret); a held key
   * repeats at up to about 50 a second. Bursts: the many small transactions of a script.
   */
  limit: { burst: 1000, perSecond: 200 },
  exerciseOf: ({ exerciseId }) => exerciseId!,
  /** The first visitor waits for the draft to be generated, before the socket opens. */
  async admit(user, { exerciseId }) {
    const mode = modeFor(user, exerciseId!);
    if (typeof mode !== 'string') return mode;
    await ensureReportDraft(exerciseId!);
    return { ok: true };
  },
  recheck(socket, { user, params }) {
    const mode = modeFor(user, params.exerciseId!);
    if (typeof mode !== 'string') return mode;
    if (mode === modeOf(params.exerciseId!, socket)) return { ok: true };
    return { ok: false, status: 403, reason: 'Your access to this report changed; open the report again' };
  },
  open(socket, { user, params }) {
    const exerciseId = params.exerciseId!;
    const mode = modeFor(user, exerciseId);
    if (typeof mode !== 'string') return socket.close(4403, mode.ok ? 'Refused' : mode.reason);
    joinReport(exerciseId, socket, user, mode);
  },
};
