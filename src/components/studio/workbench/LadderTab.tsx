/**
 * The ladder: rungs and move rules. Every change that builds is applied at
 * once and the tree is regenerated, keeping hand edits where they still apply;
 * a change that does not build is kept as a draft, with its faults beside it.
 */
import { useMemo } from 'react';
import { buildLadder, checkLadder, LadderSpecSchema, slug, type LadderSpec, type Num } from '../../../lib/engine';
import type { Scenario } from '../../../lib/scenario';
import { describeEdit } from '../../../lib/studio/tree-edits';
import { FaultList } from '../FaultList';
import { useWorkbench } from './context';
import { NumField, TextField } from './fields';
import { count } from './format';

type Props = { ladderDraft: unknown; setLadderDraft: (draft: unknown) => void };
type Values = Record<string, Num> | undefined;
type Fault = { field: string; reason: string };

function ladderFaults(candidate: unknown, document: Scenario): Fault[] {
  const shape = LadderSpecSchema.safeParse(candidate);
  if (!shape.success) return shape.error.issues.map((i) => ({ field: ['ladder', ...i.path].map((p) => (typeof p === 'number' ? `[${p}]` : `.${String(p)}`)).join('').replace(/^\./, '').replace(/\.\[/g, '['), reason: i.message }));
  const keys = document.attributes.map((a) => a.key);
  const meaning = checkLadder(shape.data, document.teams, keys);
  if (meaning.length > 0) return meaning.map((f) => ({ field: f.path, reason: f.message }));
  const built = buildLadder(shape.data, document.teams, keys);
  return built.ok ? [] : built.faults.map((f) => ({ field: f.path, reason: f.message }));
}

function freeKey(base: string, taken: string[]): string {
  const root = slug(base).slice(0, 28);
  if (!taken.includes(root)) return root;
  for (let n = 2; ; n++) if (!taken.includes(`${root}-${n}`)) return `${root}-${n}`;
}

const without = (values: Values, key: string): Values => {
  if (!values) return values;
  const { [key]: _gone, ...rest } = values;
  return Object.keys(rest).length > 0 ? rest : undefined;
};

function move<T>(items: T[], from: number, to: number): T[] {
  if (to < 0 || to >= items.length) return items;
  const out = [...items];
  const [item] = out.splice(from, 1);
  out.splice(to, 0, item!);
  return out;
}

/** Shift rung indices that point at rungs after a removed or moved rung. */
function remapRung(index: number, map: (old: number) => number): number {
  return Math.max(0, map(index));
}

export function LadderTab({ ladderDraft, setLadderDraft }: Props) {
  const { document, change, readOnly } = useWorkbench();
  const candidate = (ladderDraft ?? document.ladder) as LadderSpec | undefined;
  const faults = useMemo(() => (ladderDraft ? ladderFaults(ladderDraft, document) : []), [ladderDraft, document]);

  const update = (label: string, patch: (ladder: LadderSpec) => LadderSpec) => {
    if (!candidate) return;
    const next = patch(candidate);
    if (ladderFaults(next, document).length > 0) {
      setLadderDraft(next);
      return;
    }
    setLadderDraft(null);
    change(label, (d) => ({ ...d, ladder: next }));
  };

  if (!candidate) {
    return (
      <div className="panel max-w-2xl space-y-3 p-5">
        <h2>No ladder</h2>
        <p className="text-sm text-ink-700">
          This scenario’s tree was built by hand or imported without a ladder. Edit it in the Tree tab, or start a ladder: rungs and move rules
          from which Rungwise generates the tree. Starting a ladder replaces the current tree.
        </p>
        {!readOnly && (
          <button
            type="button"
            className="btn-accent"
            onClick={() =>
              change('start a ladder', (d) => ({
                ...d,
                ladder: {
                  rungs: [
                    { key: 'calm', name: 'Calm', intensity: 0, description: 'No pressure yet.' },
                    { key: 'conflict', name: 'Open conflict', intensity: 1, description: 'Forces are engaged.' },
                  ],
                  start: 0,
                  rounds: 1,
                  parties: d.teams.slice(0, 2).map((t) => t.id),
                  moves: { climbUpTo: 1, hold: true, stepDown: false, settle: false },
                },
              }))
            }
          >
            Start a ladder
          </button>
        )}
      </div>
    );
  }

  const rungs = candidate.rungs;
  const attributes = document.attributes;
  const setRung = (index: number, label: string, patch: Partial<LadderSpec['rungs'][number]>) =>
    update(label, (l) => ({ ...l, rungs: l.rungs.map((r, i) => (i === index ? { ...r, ...patch } : r)) }));
  const reorder = (from: number, to: number) =>
    update('reorder rungs', (l) => {
      const map = (old: number) => (old === from ? to : from < to && old > from && old <= to ? old - 1 : from > to && old >= to && old < from ? old + 1 : old);
      return { ...l, rungs: move(l.rungs, from, to), start: remapRung(l.start, map), ...(l.thirdParty ? { thirdParty: { ...l.thirdParty, fromRung: remapRung(l.thirdParty.fromRung, map) } } : {}) };
    });
  const removeRung = (index: number) =>
    update('remove a rung', (l) => {
      const map = (old: number) => (old > index ? old - 1 : old === index ? Math.max(0, index - 1) : old);
      return {
        ...l,
        rungs: l.rungs.filter((_, i) => i !== index),
        start: remapRung(l.start, map),
        ...(l.thirdParty ? { thirdParty: { ...l.thirdParty, fromRung: remapRung(l.thirdParty.fromRung, map) } } : {}),
        ...(l.chance?.fromRung !== undefined ? { chance: { ...l.chance, fromRung: remapRung(l.chance.fromRung, map) } } : {}),
      };
    });

  return (
    <div className="space-y-4">
      {ladderDraft !== null && ladderDraft !== undefined && (
        <div className="space-y-2" data-testid="ladder-draft">
          <FaultList title="This ladder does not build a tree yet. Your changes are kept here (and saved with the version) until it does; the tree still shows the last ladder that built." faults={faults} />
          {!readOnly && (
            <button type="button" className="btn-quiet py-1" onClick={() => setLadderDraft(null)}>
              Discard the unfinished changes
            </button>
          )}
        </div>
      )}
      <RebuildSummary />

      <section className="panel overflow-x-auto p-4" aria-labelledby="ladder-rungs">
        <div className="mb-2 flex items-center justify-between">
          <h2 id="ladder-rungs">Rungs, from calmest to most severe</h2>
          {!readOnly && (
            <button
              type="button"
              className="btn-quiet py-1"
              onClick={() =>
                update('add a rung', (l) => ({
                  ...l,
                  rungs: [...l.rungs, { key: freeKey(`rung ${l.rungs.length + 1}`, l.rungs.map((r) => r.key)), name: `Rung ${l.rungs.length + 1}`, intensity: (l.rungs[l.rungs.length - 1]?.intensity ?? 0) + 1, description: '' }],
                }))
              }
            >
              Add a rung
            </button>
          )}
        </div>
        <p className="mb-3 text-xs text-ink-600">Reaching the top rung ends the game at once. The description is what players read about the rung.</p>
        <table className="data-table" data-testid="rungs-table">
          <thead>
            <tr>
              <th>#</th>
              <th>Rung</th>
              <th>Intensity</th>
              <th>Shown to players</th>
              {attributes.map((a) => (
                <th key={a.key}>
                  {a.label}
                  {candidate.flows?.includes(a.key) ? ' (per round)' : ''}
                </th>
              ))}
              <th />
            </tr>
          </thead>
          <tbody>
            {rungs.map((rung, index) => (
              <tr key={rung.key}>
                <td className="text-ink-500">{index}</td>
                <td className="min-w-44">
                  <TextField label={`Name of rung ${index}`} showLabel={false} value={rung.name} onChange={(name) => setRung(index, `rename rung ${rung.key}`, { name })} readOnly={readOnly} required />
                  <span className="font-mono text-[11px] text-ink-500">{rung.key}</span>
                </td>
                <td>
                  <NumField label={`Intensity of ${rung.name}`} value={rung.intensity} className="w-16" readOnly={readOnly} onChange={(v) => setRung(index, `intensity of ${rung.key}`, { intensity: Number(v) })} />
                </td>
                <td className="min-w-64">
                  <TextField label={`Description of ${rung.name}`} showLabel={false} multiline value={rung.description} onChange={(description) => setRung(index, `describe ${rung.key}`, { description })} readOnly={readOnly} maxLength={4000} />
                </td>
                {attributes.map((a) => (
                  <td key={a.key}>
                    <NumField
                      label={`${a.label} at ${rung.name}`}
                      value={rung.attributes?.[a.key]}
                      className="w-16"
                      readOnly={readOnly}
                      onChange={(v) => setRung(index, `${a.key} at ${rung.key}`, { attributes: { ...rung.attributes, [a.key]: v } })}
                      onClear={() => setRung(index, `${a.key} at ${rung.key}`, { attributes: without(rung.attributes, a.key) })}
                    />
                  </td>
                ))}
                <td className="whitespace-nowrap">
                  {!readOnly && (
                    <>
                      <button type="button" className="btn-quiet px-2 py-1" aria-label={`Move ${rung.name} down the ladder (calmer)`} disabled={index === 0} onClick={() => reorder(index, index - 1)}>
                        ↑
                      </button>
                      <button type="button" className="btn-quiet px-2 py-1" aria-label={`Move ${rung.name} up the ladder (more severe)`} disabled={index === rungs.length - 1} onClick={() => reorder(index, index + 1)}>
                        ↓
                      </button>
                      <button type="button" className="btn-quiet px-2 py-1" aria-label={`Remove ${rung.name}`} disabled={rungs.length <= 2} onClick={() => removeRung(index)}>
                        ✕
                      </button>
                    </>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <MoveRules ladder={candidate} update={update} />
    </div>
  );
}

function RebuildSummary() {
  const { rebuildReport: report } = useWorkbench();
  if (!report) return null;
  if (!report.ok) return <FaultList title="The tree could not be rebuilt from the ladder; it stays as it was" faults={report.faults.map((f) => ({ field: f.path, reason: f.message }))} />;
  const lost = report.dropped.length > 0 || report.dangling.length > 0 || report.replacedHandBuilt;
  return (
    <div role="status" className={`rounded-md border px-3 py-2 text-sm ${lost ? 'border-bronze-600 bg-bronze-100 text-bronze-800' : 'border-moss-600 bg-moss-100 text-moss-700'}`} data-testid="rebuild-report">
      <p>
        Tree rebuilt from the ladder: {count(report.nodes, 'node')}. {report.kept.length > 0 ? `Kept ${count(report.kept.length, 'hand edit')}.` : 'No hand edits to keep.'}
      </p>
      {report.replacedHandBuilt && <p>The previous tree did not come from this ladder, so it was replaced as a whole.</p>}
      {report.dropped.length > 0 && (
        <>
          <p className="mt-1 font-medium">Could not keep:</p>
          <ul className="list-disc pl-5">
            {report.dropped.map(({ edit, reason }, i) => (
              <li key={i}>
                {describeEdit(edit)}: {reason}
              </li>
            ))}
          </ul>
        </>
      )}
      {report.dangling.length > 0 && (
        <>
          <p className="mt-1 font-medium">Now pointing at nothing (fix or remove them):</p>
          <ul className="list-disc pl-5">
            {report.dangling.map((d) => (
              <li key={d}>{d}</li>
            ))}
          </ul>
        </>
      )}
    </div>
  );
}

type RulesProps = { ladder: LadderSpec; update: (label: string, patch: (ladder: LadderSpec) => LadderSpec) => void };

function Check({ label, checked, onChange, disabled }: { label: string; checked: boolean; onChange: (v: boolean) => void; disabled?: boolean }) {
  return (
    <label className="flex items-center gap-2 text-sm">
      <input type="checkbox" checked={checked} disabled={disabled} onChange={(e) => onChange(e.target.checked)} /> {label}
    </label>
  );
}

function RungSelect({ label, value, rungs, onChange, disabled }: { label: string; value: number; rungs: LadderSpec['rungs']; onChange: (v: number) => void; disabled?: boolean }) {
  return (
    <label className="block text-sm">
      <span className="field-label">{label}</span>
      <select className="field-input py-1" value={value} disabled={disabled} onChange={(e) => onChange(Number(e.target.value))}>
        {rungs.map((r, i) => (
          <option key={r.key} value={i}>
            {i}. {r.name}
          </option>
        ))}
      </select>
    </label>
  );
}

function MoveRules({ ladder, update }: RulesProps) {
  const { document, readOnly } = useWorkbench();
  const teams = document.teams;
  const parties = ladder.parties;
  const name = (id: string) => teams.find((t) => t.id === id)?.name ?? id;
  const setMoves = (patch: Partial<LadderSpec['moves']>) => update('edit the move rules', (l) => ({ ...l, moves: { ...l.moves, ...patch } }));
  const others = teams.filter((t) => !parties.includes(t.id));
  return (
    <div className="space-y-4">
      <section className="panel space-y-3 p-4" aria-labelledby="ladder-rules">
        <h2 id="ladder-rules">Move rules</h2>
        <div className="grid max-w-3xl grid-cols-2 gap-3 sm:grid-cols-3">
          <NumField label="Rounds" showLabel value={ladder.rounds} integer min={1} max={8} readOnly={readOnly} onChange={(v) => update('set the rounds', (l) => ({ ...l, rounds: Number(v) }))} />
          <RungSelect label="The crisis starts at" value={ladder.start} rungs={ladder.rungs} disabled={readOnly} onChange={(start) => update('set the start rung', (l) => ({ ...l, start }))} />
          <NumField label="Climb up to (rungs a move)" showLabel value={ladder.moves.climbUpTo} integer min={1} max={8} readOnly={readOnly} onChange={(v) => setMoves({ climbUpTo: Number(v) })} />
        </div>
        <fieldset className="flex flex-wrap gap-4" disabled={readOnly}>
          <legend className="field-label">A party may also</legend>
          <Check label="hold" checked={ladder.moves.hold} onChange={(hold) => setMoves({ hold })} />
          <Check label="step down one rung" checked={ladder.moves.stepDown} onChange={(stepDown) => setMoves({ stepDown })} />
          <Check label="settle where the crisis stands" checked={ladder.moves.settle} onChange={(settle) => setMoves({ settle })} />
        </fieldset>
        <fieldset disabled={readOnly}>
          <legend className="field-label">Parties, in the order they move each round</legend>
          <ol className="space-y-1">
            {parties.map((id, i) => (
              <li key={id} className="flex items-center gap-2 text-sm">
                <span className="w-5 text-ink-500">{i + 1}.</span>
                <span className="flex-1">{name(id)}</span>
                <button type="button" className="btn-quiet px-2 py-0.5" aria-label={`${name(id)} moves earlier`} disabled={i === 0} onClick={() => update('reorder parties', (l) => ({ ...l, parties: move(l.parties, i, i - 1) }))}>
                  ↑
                </button>
                <button type="button" className="btn-quiet px-2 py-0.5" aria-label={`${name(id)} moves later`} disabled={i === parties.length - 1} onClick={() => update('reorder parties', (l) => ({ ...l, parties: move(l.parties, i, i + 1) }))}>
                  ↓
                </button>
                <button type="button" className="btn-quiet px-2 py-0.5" aria-label={`${name(id)} does not move`} disabled={parties.length <= 1} onClick={() => update('remove a party', (l) => ({ ...l, parties: l.parties.filter((p) => p !== id) }))}>
                  ✕
                </button>
              </li>
            ))}
          </ol>
          {others.filter((t) => t.id !== ladder.thirdParty?.team).length > 0 && (
            <div className="mt-2 flex flex-wrap gap-2">
              {others
                .filter((t) => t.id !== ladder.thirdParty?.team)
                .map((t) => (
                  <button key={t.id} type="button" className="btn-quiet py-0.5" onClick={() => update('add a party', (l) => ({ ...l, parties: [...l.parties, t.id] }))}>
                    + {t.name} moves too
                  </button>
                ))}
            </div>
          )}
        </fieldset>
        <label className="block text-sm">
          <span className="field-label">Round in which the parties choose at the same time</span>
          <select
            className="field-input py-1"
            disabled={readOnly || parties.length < 2}
            value={ladder.simultaneousRound ?? ''}
            onChange={(e) => update('set the simultaneous round', (l) => ({ ...l, simultaneousRound: e.target.value === '' ? null : Number(e.target.value) }))}
          >
            <option value="">none: each party sees the moves before its own</option>
            {Array.from({ length: ladder.rounds }, (_, i) => (
              <option key={i + 1} value={i + 1}>
                round {i + 1}
              </option>
            ))}
          </select>
        </label>
        <fieldset className="flex flex-wrap gap-4" disabled={readOnly}>
          <legend className="field-label">Attributes that add up round by round (costs, casualties); the others count where the crisis ends</legend>
          {document.attributes.map((a) => (
            <Check
              key={a.key}
              label={a.label}
              checked={ladder.flows?.includes(a.key) ?? false}
              onChange={(on) => update('set what adds up', (l) => ({ ...l, flows: on ? [...(l.flows ?? []), a.key] : (l.flows ?? []).filter((k) => k !== a.key) }))}
            />
          ))}
        </fieldset>
        <PartyValues title="What settling costs the settling team" field="concessions" ladder={ladder} update={update} disabled={!ladder.moves.settle} />
        <PartyValues title="What stepping down costs the team that steps down" field="stepDownCosts" ladder={ladder} update={update} disabled={!ladder.moves.stepDown} />
      </section>

      <ThirdParty ladder={ladder} update={update} />
      <ChanceEvent ladder={ladder} update={update} />
    </div>
  );
}

function PartyValues({ title, field, ladder, update, disabled }: RulesProps & { title: string; field: 'concessions' | 'stepDownCosts'; disabled: boolean }) {
  const { document, readOnly } = useWorkbench();
  if (disabled || document.attributes.length === 0) return null;
  const values = ladder[field] ?? {};
  return (
    <div className="overflow-x-auto">
      <p className="field-label">{title}</p>
      <table className="data-table">
        <thead>
          <tr>
            <th>Team</th>
            {document.attributes.map((a) => (
              <th key={a.key}>{a.label}</th>
            ))}
          </tr>
        </thead>
        <tbody>
          {ladder.parties.map((team) => (
            <tr key={team}>
              <td>{document.teams.find((t) => t.id === team)?.name ?? team}</td>
              {document.attributes.map((a) => (
                <td key={a.key}>
                  <NumField
                    label={`${a.label} for ${team}: ${title}`}
                    value={values[team]?.[a.key]}
                    className="w-16"
                    readOnly={readOnly}
                    onChange={(v) => update(`edit ${field}`, (l) => ({ ...l, [field]: { ...l[field], [team]: { ...l[field]?.[team], [a.key]: v } } }))}
                    onClear={() => update(`edit ${field}`, (l) => ({ ...l, [field]: { ...l[field], [team]: without(l[field]?.[team], a.key) ?? {} } }))}
                  />
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

type Row = { key: string; label: string; shift: number; attributes?: Record<string, Num> };

function OptionRows<R extends Row>({ rows, kind, onChange, extra }: { rows: R[]; kind: string; onChange: (rows: R[], label: string) => void; extra?: (row: R, set: (patch: Partial<R>) => void) => React.ReactNode }) {
  const { document, readOnly } = useWorkbench();
  const set = (i: number, patch: Partial<R>) => onChange(rows.map((r, k) => (k === i ? { ...r, ...patch } : r)), `edit ${kind}`);
  return (
    <div className="overflow-x-auto">
    <table className="data-table">
      <thead>
        <tr>
          <th>{kind}</th>
          <th>Rungs moved</th>
          {extra && <th />}
          {document.attributes.map((a) => (
            <th key={a.key}>{a.label}</th>
          ))}
          <th />
        </tr>
      </thead>
      <tbody>
        {rows.map((row, i) => (
          <tr key={row.key}>
            <td className="min-w-40">
              <TextField label={`Label of ${kind} ${row.key}`} showLabel={false} value={row.label} onChange={(label) => set(i, { label } as Partial<R>)} readOnly={readOnly} required />
              <span className="font-mono text-[11px] text-ink-500">{row.key}</span>
            </td>
            <td>
              <NumField label={`Rungs moved by ${row.label}`} value={row.shift} integer className="w-14" readOnly={readOnly} onChange={(v) => set(i, { shift: Number(v) } as Partial<R>)} />
            </td>
            {extra && <td>{extra(row, (patch) => set(i, patch))}</td>}
            {document.attributes.map((a) => (
              <td key={a.key}>
                <NumField
                  label={`${a.label} of ${row.label}`}
                  value={row.attributes?.[a.key]}
                  className="w-14"
                  readOnly={readOnly}
                  onChange={(v) => set(i, { attributes: { ...row.attributes, [a.key]: v } } as Partial<R>)}
                  onClear={() => set(i, { attributes: without(row.attributes, a.key) } as Partial<R>)}
                />
              </td>
            ))}
            <td>
              {!readOnly && rows.length > 1 && (
                <button type="button" className="btn-quiet px-2 py-1" aria-label={`Remove ${row.label}`} onClick={() => onChange(rows.filter((_, k) => k !== i), `remove a ${kind}`)}>
                  ✕
                </button>
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
    </div>
  );
}

function ThirdParty({ ladder, update }: RulesProps) {
  const { document, readOnly } = useWorkbench();
  const tp = ladder.thirdParty;
  const candidates = document.teams.filter((t) => !ladder.parties.includes(t.id));
  return (
    <section className="panel space-y-3 p-4" aria-labelledby="ladder-third">
      <div className="flex items-center justify-between">
        <h2 id="ladder-third">Third party</h2>
        {!readOnly &&
          (tp ? (
            <button type="button" className="btn-quiet py-1" onClick={() => update('remove the third party', ({ thirdParty: _gone, ...l }) => l)}>
              Remove
            </button>
          ) : (
            candidates.length > 0 && (
              <button
                type="button"
                className="btn-quiet py-1"
                onClick={() =>
                  update('add a third party', (l) => ({
                    ...l,
                    thirdParty: { team: candidates[0]!.id, fromRung: 0, actions: [{ key: 'aside', label: 'Stand aside', shift: 0, ends: false }, { key: 'broker', label: 'Broker a settlement', shift: 0, ends: true }] },
                  }))
                }
              >
                Add a third party
              </button>
            )
          ))}
      </div>
      {!tp ? (
        <p className="text-sm text-ink-600">
          {candidates.length > 0 ? 'No third party moves. Add one to let a mediator or another state act after the parties each round.' : 'Every team is a party. Add a team in the Overview to give it the third-party role.'}
        </p>
      ) : (
        <>
          <div className="grid grid-cols-2 gap-3">
            <label className="block text-sm">
              <span className="field-label">Team</span>
              <select className="field-input py-1" value={tp.team} disabled={readOnly} onChange={(e) => update('set the third party', (l) => ({ ...l, thirdParty: { ...l.thirdParty!, team: e.target.value } }))}>
                {candidates.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </select>
            </label>
            <RungSelect label="Acts once the crisis reaches" value={tp.fromRung} rungs={ladder.rungs} disabled={readOnly} onChange={(fromRung) => update('set when the third party acts', (l) => ({ ...l, thirdParty: { ...l.thirdParty!, fromRung } }))} />
          </div>
          <OptionRows
            kind="action"
            rows={tp.actions}
            onChange={(actions, label) => update(label, (l) => ({ ...l, thirdParty: { ...l.thirdParty!, actions } }))}
            extra={(row, set) => (
              <label className="flex items-center gap-1 text-xs whitespace-nowrap">
                <input type="checkbox" checked={row.ends} disabled={readOnly} onChange={(e) => set({ ends: e.target.checked })} /> ends it
              </label>
            )}
          />
          {!readOnly && (
            <button
              type="button"
              className="btn-quiet py-1"
              onClick={() => update('add a third-party action', (l) => ({ ...l, thirdParty: { ...l.thirdParty!, actions: [...l.thirdParty!.actions, { key: freeKey(`action ${l.thirdParty!.actions.length + 1}`, l.thirdParty!.actions.map((a) => a.key)), label: `Action ${l.thirdParty!.actions.length + 1}`, shift: 0, ends: false }] } }))}
            >
              Add an action
            </button>
          )}
        </>
      )}
    </section>
  );
}

function ChanceEvent({ ladder, update }: RulesProps) {
  const { readOnly } = useWorkbench();
  const chance = ladder.chance;
  return (
    <section className="panel space-y-3 p-4" aria-labelledby="ladder-chance">
      <div className="flex items-center justify-between">
        <h2 id="ladder-chance">Chance event</h2>
        {!readOnly &&
          (chance ? (
            <button type="button" className="btn-quiet py-1" onClick={() => update('remove the chance event', ({ chance: _gone, ...l }) => l)}>
              Remove
            </button>
          ) : (
            <button
              type="button"
              className="btn-quiet py-1"
              onClick={() =>
                update('add a chance event', (l) => ({
                  ...l,
                  chance: { afterRound: 1, label: 'Incident', outcomes: [{ key: 'quiet', label: 'Nothing happens', p: '3/4', shift: 0 }, { key: 'incident', label: 'An incident', p: '1/4', shift: 1 }] },
                }))
              }
            >
              Add a chance event
            </button>
          ))}
      </div>
      {!chance ? (
        <p className="text-sm text-ink-600">Nothing is left to chance. Add an event (an incident, a leak) that may shift the crisis after a round.</p>
      ) : (
        <>
          <div className="grid grid-cols-2 gap-3 sm:grid-cols-3">
            <TextField label="Name" value={chance.label} readOnly={readOnly} required onChange={(label) => update('name the chance event', (l) => ({ ...l, chance: { ...l.chance!, label } }))} />
            <NumField label="After round" showLabel value={chance.afterRound} integer min={1} max={ladder.rounds} readOnly={readOnly} onChange={(v) => update('time the chance event', (l) => ({ ...l, chance: { ...l.chance!, afterRound: Number(v) } }))} />
            <RungSelect label="Only from rung" value={chance.fromRung ?? 0} rungs={ladder.rungs} disabled={readOnly} onChange={(fromRung) => update('set when chance acts', (l) => ({ ...l, chance: { ...l.chance!, fromRung } }))} />
          </div>
          <OptionRows
            kind="outcome"
            rows={chance.outcomes}
            onChange={(outcomes, label) => update(label, (l) => ({ ...l, chance: { ...l.chance!, outcomes } }))}
            extra={(row, set) => <NumField label={`Probability of ${row.label}`} value={row.p} className="w-16" readOnly={readOnly} onChange={(p) => set({ p })} />}
          />
          <p className="text-xs text-ink-600">Probabilities must add up to 1; write them as fractions (1/3) to keep them exact.</p>
          {!readOnly && (
            <button
              type="button"
              className="btn-quiet py-1"
              onClick={() => update('add a chance outcome', (l) => ({ ...l, chance: { ...l.chance!, outcomes: [...l.chance!.outcomes, { key: freeKey(`outcome ${l.chance!.outcomes.length + 1}`, l.chance!.outcomes.map((o) => o.key)), label: `Outcome ${l.chance!.outcomes.length + 1}`, p: 0, shift: 0 }] } }))}
            >
              Add an outcome
            </button>
          )}
        </>
      )}
    </section>
  );
}
