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
  admit(user, { id }) {
    const exercise = db().select().from(schema.exercise).where(eq(schema.exercise.id, id!)).get();
    const seat = exercise ? (memberOf(exercise.id, user.id)?.seat ?? null) : null;
    return decide(user, 'exercise.view', { seat, state: exercise?.state ?? 'draft', settings: readSettings(exercise?.settings) });
  },
  open(socket, ctx) {
    exerciseHub().connect(socket, ctx.user, ctx.params.id!);
  },
};
