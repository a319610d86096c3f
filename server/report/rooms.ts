/** The open report documents of this process, one room per exercise, closed when the last peer leaves. */
import type { WebSocket } from 'ws';
import type { SessionUser } from '../../src/lib/auth';
import { markReportDocOpen } from '../../src/lib/report/open-docs';
import { shared } from '../../src/lib/runtime';
import { ReportRoom, type PeerMode } from './room';

const rooms = () => shared('report.rooms', () => new Map<string, ReportRoom>());

function closeRoom(room: ReportRoom): void {
  if (rooms().get(room.exerciseId) !== room) return;
  rooms().delete(room.exerciseId);
  markReportDocOpen(room.exerciseId, null);
  room.compact();
  room.destroy();
}

/** The mode an open socket joined its report with; null when it is not in the room. */
export function modeOf(exerciseId: string, socket: WebSocket): PeerMode | null {
  return rooms().get(exerciseId)?.modeOf(socket) ?? null;
}

export function joinReport(exerciseId: string, socket: WebSocket, user: SessionUser, mode: PeerMode): ReportRoom {
  let room = rooms().get(exerciseId);
  if (!room) {
    room = new ReportRoom(exerciseId, closeRoom);
    rooms().set(exerciseId, room);
    markReportDocOpen(exerciseId, room.doc);
  }
  room.join(socket, user, mode);
  return room;
}
