/** Invitations: the only way to get an account. The token is mailed; its hash is stored. */
import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { db, schema } from '../db/client';
import { PLATFORM_ROLES, EXERCISE_ROLES } from '../db/schema';
import { createAccount } from './accounts';
import { loadConfig } from './config';
import { HttpError } from './http';
import { invitationMail } from './mail-templates';
import { sendMail } from './mail';

const WEEK_MS = 7 * 24 * 60 * 60 * 1000;

export const invitationInput = z.object({
  email: z.email('Enter a valid e-mail address').max(254),
  role: z.enum(PLATFORM_ROLES).default('member'),
});

export const exerciseInvitationInput = invitationInput.extend({
  exerciseRole: z.enum(EXERCISE_ROLES),
  teamId: z.string().min(1).nullable().default(null),
});

export const acceptInput = z.object({
  token: z.string().min(20, 'The invitation link is incomplete'),
  name: z.string().trim().min(2, 'Enter your name (2 characters or more)').max(120),
  password: z.string().min(10, 'Use at least 10 characters').max(128, 'Use at most 128 characters'),
});

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

export type Inviter = { id: string; name: string };
export type ExerciseSeatInvite = { exerciseId: string; exerciseRole: (typeof EXERCISE_ROLES)[number]; teamId: string | null; label: string };

export async function invite(
  inviter: Inviter,
  input: z.infer<typeof invitationInput>,
  seat?: ExerciseSeatInvite,
): Promise<{ id: string; link: string }> {
  const email = input.email.toLowerCase();
  const existing = db().select({ id: schema.user.id }).from(schema.user).where(eq(schema.user.email, email)).get();
  if (existing) {
    throw new HttpError(409, 'This address has an account already', [{ field: 'email', reason: 'already registered' }]);
  }
  const token = randomBytes(32).toString('base64url');
  const id = crypto.randomUUID();
  db()
    .insert(schema.invitation)
    .values({
      id,
      email,
      role: input.role,
      tokenHash: hashToken(token),
      invitedBy: inviter.id,
      exerciseId: seat?.exerciseId ?? null,
      exerciseRole: seat?.exerciseRole ?? null,
      teamId: seat?.teamId ?? null,
      expiresAt: new Date(Date.now() + WEEK_MS),
    })
    .run();
  const link = `${loadConfig().publicUrl}/invitation?token=${token}`;
  await sendMail({ to: email, ...invitationMail(inviter.name, link, seat?.label) });
  return { id, link };
}

/** The open invitation behind a token, or an error saying why it cannot be used. */
export function openInvitation(token: string) {
  const row = db().select().from(schema.invitation).where(eq(schema.invitation.tokenHash, hashToken(token))).get();
  if (!row) throw new HttpError(404, 'This invitation link is not valid');
  if (row.acceptedAt) throw new HttpError(410, 'This invitation has been used already; sign in instead');
  if (row.revokedAt) throw new HttpError(410, 'This invitation was withdrawn');
  if (row.expiresAt.getTime() < Date.now()) throw new HttpError(410, 'This invitation has expired; ask for a new one');
  return row;
}

export async function acceptInvitation(input: z.infer<typeof acceptInput>): Promise<{ email: string; userId: string }> {
  const invitation = openInvitation(input.token);
  const userId = await createAccount({
    email: invitation.email,
    name: input.name,
    password: input.password,
    role: invitation.role,
  });
  db().transaction((tx) => {
    tx.update(schema.invitation)
      .set({ acceptedAt: new Date(), acceptedUserId: userId })
      .where(eq(schema.invitation.id, invitation.id))
      .run();
    if (invitation.exerciseId && invitation.exerciseRole) {
      tx.insert(schema.membership)
        .values({
          id: crypto.randomUUID(),
          exerciseId: invitation.exerciseId,
          userId,
          role: invitation.exerciseRole,
          teamId: invitation.teamId,
        })
        .run();
    }
  });
  if (invitation.exerciseId) {
    const { seatAccepted } = await import('./exercise/service');
    seatAccepted(invitation.exerciseId, { id: userId, name: input.name });
  }
  return { email: invitation.email, userId };
}

export function pendingInvitations() {
  return db()
    .select({
      id: schema.invitation.id,
      email: schema.invitation.email,
      role: schema.invitation.role,
      createdAt: schema.invitation.createdAt,
      expiresAt: schema.invitation.expiresAt,
    })
    .from(schema.invitation)
    .where(and(isNull(schema.invitation.acceptedAt), isNull(schema.invitation.revokedAt)))
    .orderBy(desc(schema.invitation.createdAt))
    .all();
}

export function revokeInvitation(id: string): void {
  const result = db()
    .update(schema.invitation)
    .set({ revokedAt: new Date() })
    .where(and(eq(schema.invitation.id, id), isNull(schema.invitation.acceptedAt)))
    .run();
  if (result.changes === 0) throw new HttpError(404, 'No open invitation with this id');
}
