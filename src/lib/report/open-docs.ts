/**
 * The report documents held open by a room in this process (server/report/rooms.ts
 * keeps the list), so that a change made over HTTP goes through the room's copy:
 * stored by the room and sent to everyone editing at once.
 */
import type * as Y from 'yjs';
import { shared } from '../runtime';

const openDocs = () => shared('report.open-docs', () => new Map<string, Y.Doc>());

export const openReportDoc = (exerciseId: string): Y.Doc | undefined => openDocs().get(exerciseId);

export function markReportDocOpen(exerciseId: string, doc: Y.Doc | null): void {
  if (doc) openDocs().set(exerciseId, doc);
  else openDocs().delete(exerciseId);
}
