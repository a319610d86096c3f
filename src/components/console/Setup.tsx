/** The Console's set-up tab: the roster (seat by e-mail, or invite), the exercise settings, and the audit log. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { api, ApiError, describeError } from '../../lib/client/api';
import { EXERCISE_ROLES } from '../../lib/roles';
import { settingsShape } from '../../lib/exercise/settings';
import type { Snapshot } from '../../lib/exercise/view';
import { Field, FormMessage } from '../ui/Field';
import { useIntent, type Send } from '../desk/live';
import { Empty, Panel, TeamName, teamName } from '../desk/parts';
import { SubmitButton } from '../ui/SubmitButton';

const SEAT_WORDS = { facilitator: 'Facilitator', player: 'Player', observer: 'Observer', sponsor: 'Sponsor' } as const;

const seatSchema = z
  .object({ email: z.email('Enter a valid e-mail address'), role: z.enum(EXERCISE_ROLES), teamId: z.string(), isLead: z.boolean() })
  .refine((v) => v.role !== 'player' || v.teamId !== '', { path: ['teamId'], message: 'Choose the player’s team' });
type SeatValues = z.infer<typeof seatSchema>;

export function Roster({ exerciseId, view }: { exerciseId: string; view: Snapshot; send: Send }) {
  const roster = view.roster;
  const teams = view.exercise.teams;
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const { register, handleSubmit, watch, reset, setError, formState } = useForm<SeatValues>({
    resolver: zodResolver(seatSchema),
    defaultValues: { email: '', role: 'player', teamId: teams[0]?.id ?? '', isLead: false },
  });
  const role = watch('role');
  const seat = async (values: SeatValues) => {
    setMessage(null);
    try {
      const body = { email: values.email, role: values.role, teamId: values.role === 'player' ? values.teamId : null, isLead: values.role === 'player' && values.isLead };
      const answer = await api<{ seated: 'member' | 'invited' }>(`/api/exercises/${exerciseId}/roster`, { method: 'POST', json: body });
      setMessage({ tone: 'ok', text: answer.seated === 'member' ? `${values.email} is on the roster and was told by e-mail.` : `${values.email} has no account yet: an invitation with a join link went out.` });
      reset({ ...values, email: '', isLead: false });
    } catch (error) {
      if (error instanceof ApiError) for (const f of error.fields) if (f.field === 'email' || f.field === 'teamId') setError(f.field, { message: f.reason });
      setMessage({ tone: 'error', text: describeError(error) });
    }
  };
  const remove = async (membershipId: string, name: string) => {
    setMessage(null);
    try {
      await api(`/api/exercises/${exerciseId}/roster/${membershipId}`, { method: 'DELETE' });
      setMessage({ tone: 'ok', text: `${name} is off the roster.` });
    } catch (error) {
      setMessage({ tone: 'error', text: describeError(error) });
    }
  };
  if (!roster) return null;
  return (
    <Panel title="Roster" id="roster">
      <table className="data-table mb-4" data-testid="roster">
        <thead>
          <tr>
            <th>Person</th>
            <th>Seat</th>
            <th>
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {roster.members.map((m) => (
            <tr key={m.membershipId}>
              <td>
                <div className="font-medium">{m.name}</div>
                <div className="text-xs text-ink-500">{m.email}</div>
              </td>
              <td className="text-sm">
                {SEAT_WORDS[m.role]}
                {m.teamId && (
                  <>
                    {' '}
                    · <TeamName teams={teams} teamId={m.teamId} />
                  </>
                )}
                {m.isLead && <span className="tag ml-1 bg-ink-100 text-ink-700">lead</span>}
              </td>
              <td className="text-right">
                {m.userId !== view.me.userId && (
                  <button type="button" className="btn-quiet py-1 text-xs" onClick={() => void remove(m.membershipId, m.name)}>
                    Remove
                  </button>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {roster.invitations.length > 0 && (
        <div className="mb-4">
          <p className="mb-1 text-xs font-semibold tracking-wide text-ink-500 uppercase">Invited, not yet joined</p>
          <ul className="text-sm">
            {roster.invitations.map((i) => (
              <li key={i.id}>
                {i.email} · {i.role ? SEAT_WORDS[i.role] : ''}
                {i.teamId ? ` · ${teamName(teams, i.teamId)}` : ''}
              </li>
            ))}
          </ul>
        </div>
      )}
      <form onSubmit={handleSubmit(seat)} className="space-y-3" noValidate aria-label="Add someone to the roster">
        <h3 className="text-sm font-semibold">Add someone</h3>
        {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
        <Field id="seat-email" label="E-mail address" error={formState.errors.email?.message} hint="People without an account get an invitation with a join link.">
          <input id="seat-email" type="email" className="field-input" {...register('email')} />
        </Field>
        <div className="grid gap-3 sm:grid-cols-2">
          <Field id="seat-role" label="Seat">
            <select id="seat-role" className="field-input" {...register('role')}>
              {EXERCISE_ROLES.map((r) => (
                <option key={r} value={r}>
                  {SEAT_WORDS[r]}
                </option>
              ))}
            </select>
          </Field>
          {role === 'player' && (
            <Field id="seat-team" label="Team" error={formState.errors.teamId?.message}>
              <select id="seat-team" className="field-input" {...register('teamId')}>
                {teams.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </select>
            </Field>
          )}
        </div>
        {role === 'player' && (
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" {...register('isLead')} /> Team lead (submits the team’s move unless any member may)
          </label>
        )}
        <SubmitButton className="btn-primary" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Adding…' : 'Add to the roster'}
        </SubmitButton>
      </form>
    </Panel>
  );
}

const settingsForm = z.object({
  submitter: settingsShape.submitter,
  analysisForPlayers: settingsShape.analysisForPlayers,
  playersMayComment: settingsShape.playersMayComment,
  timed: z.boolean(),
  turnMinutes: z.coerce.number().min(0.5, 'at least half a minute').max(10_080, 'at most a week'),
  atDeadline: settingsShape.atDeadline,
  forecastLambda: z.coerce.number().min(0, '0 or more').max(50, 'at most 50'),
  tags: z.string().max(2000),
});
type SettingsValues = z.input<typeof settingsForm>;

export function SettingsForm({ view, send }: { view: Snapshot; send: Send }) {
  const s = view.exercise.settings;
  const save = useIntent(send);
  const { register, handleSubmit, watch, formState } = useForm<SettingsValues, unknown, z.output<typeof settingsForm>>({
    resolver: zodResolver(settingsForm),
    defaultValues: {
      submitter: s.submitter,
      analysisForPlayers: s.analysisForPlayers ?? false,
      playersMayComment: s.playersMayComment ?? false,
      timed: s.turnSeconds !== null,
      turnMinutes: s.turnSeconds === null ? 10 : s.turnSeconds / 60,
      atDeadline: s.atDeadline,
      forecastLambda: s.forecastLambda ?? 1,
      tags: (s.tags ?? []).join(', '),
    },
  });
  const timed = watch('timed');
  const submit = (v: z.output<typeof settingsForm>) =>
    void save.run(
      {
        kind: 'settings',
        patch: {
          submitter: v.submitter,
          analysisForPlayers: v.analysisForPlayers,
          playersMayComment: v.playersMayComment,
          turnSeconds: v.timed ? Math.round(v.turnMinutes * 60) : null,
          atDeadline: v.atDeadline,
          forecastLambda: v.forecastLambda,
          tags: [...new Set(v.tags.split(',').map((t) => t.trim()).filter(Boolean))],
        },
      },
      'Settings saved',
    );
  return (
    <Panel title="Settings" id="settings">
      <form onSubmit={handleSubmit(submit)} className="space-y-3" noValidate aria-label="Exercise settings">
        <Field id="set-submitter" label="Who submits a team’s move">
          <select id="set-submitter" className="field-input" {...register('submitter')}>
            <option value="lead">The team lead</option>
            <option value="any">Any member of the team</option>
          </select>
        </Field>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" {...register('timed')} /> Turns have a deadline
        </label>
        {timed && (
          <div className="grid gap-3 sm:grid-cols-2">
            <Field id="set-minutes" label="Minutes per turn" error={formState.errors.turnMinutes?.message}>
              <input id="set-minutes" type="number" step="0.5" min="0.5" className="field-input" {...register('turnMinutes')} />
            </Field>
            <Field id="set-deadline" label="At the deadline">
              <select id="set-deadline" className="field-input" {...register('atDeadline')}>
                <option value="facilitator">I decide the late team’s move</option>
                <option value="hold">The late team holds its position</option>
              </select>
            </Field>
          </div>
        )}
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" {...register('analysisForPlayers')} /> Show the equilibrium and the forecast to players
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" {...register('playersMayComment')} /> Players may comment on the report draft
        </label>
        <Field id="set-lambda" label="Forecast rationality λ (logit QRE)" error={formState.errors.forecastLambda?.message} hint="0 is random play; larger values approach equilibrium play.">
          <input id="set-lambda" type="number" step="0.1" min="0" className="field-input" {...register('forecastLambda')} />
        </Field>
        <Field id="set-tags" label="Observer-log tags" hint="Separated by commas." error={formState.errors.tags?.message}>
          <textarea id="set-tags" rows={2} className="field-input" {...register('tags')} />
        </Field>
        {save.error && <FormMessage tone="error">{save.error}</FormMessage>}
        {save.done && <FormMessage tone="ok">{save.done}</FormMessage>}
        <SubmitButton className="btn-primary" disabled={save.busy}>
          Save the settings
        </SubmitButton>
      </form>
    </Panel>
  );
}

export function AuditLog({ view }: { view: Snapshot }) {
  const log = view.log ?? [];
  return (
    <Panel title="Audit log" id="log" actions={<span className="text-xs text-ink-500">Every committed change, numbered; draft edits are kept but not listed.</span>}>
      {log.length === 0 ? (
        <Empty>Nothing logged yet.</Empty>
      ) : (
        <ol className="divide-y divide-ink-100 text-sm" data-testid="audit-log">
          {[...log].reverse().map((e) => (
            <li key={e.seq} className="flex gap-3 py-1.5">
              <span className="w-10 shrink-0 text-right font-mono text-xs text-ink-500">{e.seq}</span>
              <span className="w-16 shrink-0 text-xs text-ink-500">{new Date(e.at).toLocaleTimeString('en-GB')}</span>
              <span>{e.summary}</span>
            </li>
          ))}
        </ol>
      )}
    </Panel>
  );
}
