/** The exercise channel: /ws/exercise/<id>, for everyone seated in the exercise. */
import { eq } from 'drizzle-orm';
import { db, schema } from '../../src/db/client';
import { decide } from '../../src/lib/access';
import { readSettings } from '../../src/lib/exercise/settings';
import { memberOf } from '../../src/lib/exercise/state';
import type { SocketRoute } from '../sockets';
import { exerciseHub } from './hub';

export const exerciseRoute: SocketRoute = {
  pattern: /^\/ws\/exercise\/(?<id>[\w-]{1,64})$/,
  /** A screen sends a draft at most every 600 ms and a ping every 10 s; the bench's busiest client about 5 a second. */
  limit: { burst: 200, perSecond: 20 },
  exerciseOf: ({ id }) => id!,
  admit(user, { id }) {
    const exercise = db().select().from(schema.exercise).where(eq(schema.exercise.id, id!)).get();
    const seat = exercise ? (memberOf(exercise.id, user.id)?.seat ?? null) : null;
    return decide(user, 'exercise.view', { seat, state: exercise?.state ?? 'draft', settings: readSettings(exercise?.settings) });
  },
  open(socket, ctx) {
    exerciseHub().connect(socket, ctx.user, ctx.params.id!);
  },
};
