/** Overview: title, setting and general brief; the teams with objectives and private briefs; attributes and weights. */
import type { JSONContent } from '@tiptap/react';
import { useEffect, useState } from 'react';
import { slug } from '../../../lib/engine';
import type { RichText as RichTextValue, Scenario } from '../../../lib/scenario';
import { RichText } from '../RichText';
import { useWorkbench } from './context';
import { NumField, TextField } from './fields';

type Team = Scenario['teams'][number];
type Attribute = Scenario['attributes'][number];

const MAX_TEAMS = 6;

function freeKey(base: string, taken: string[]): string {
  const root = slug(base);
  if (!taken.includes(root)) return root;
  for (let n = 2; ; n++) if (!taken.includes(`${root}-${n}`)) return `${root}-${n}`;
}

export function OverviewTab() {
  const { document, change, readOnly } = useWorkbench();
  const set = <K extends keyof Scenario>(key: K, label: string) => (value: Scenario[K]) => change(label, (d) => ({ ...d, [key]: value }));
  const setTeam = (index: number, label: string, patch: Partial<Team>) =>
    change(label, (d) => ({ ...d, teams: d.teams.map((t, i) => (i === index ? { ...t, ...patch } : t)) }));

  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <section className="panel space-y-3 p-4" aria-labelledby="overview-general">
        <h2 id="overview-general">Setting and general brief</h2>
        <TextField label="Title" value={document.title} onChange={set('title', 'edit the title')} readOnly={readOnly} required maxLength={300} />
        <TextField
          label="Setting"
          value={document.setting}
          onChange={set('setting', 'edit the setting')}
          readOnly={readOnly}
          multiline
          maxLength={2000}
          hint="A few lines on where and when; shown in the library and at the top of every brief."
        />
        <div>
          <span className="field-label" id="general-brief-label">
            General brief (every participant reads it)
          </span>
          <RichText
            id="general-brief"
            label="General brief"
            value={(document.brief as JSONContent | undefined) ?? null}
            onChange={(value) => change('edit the general brief', (d) => ({ ...d, brief: value as RichTextValue }))}
            readOnly={readOnly}
          />
        </div>
      </section>

      <section className="panel space-y-3 p-4" aria-labelledby="overview-teams">
        <div className="flex items-center justify-between">
          <h2 id="overview-teams">Teams</h2>
          {!readOnly && document.teams.length < MAX_TEAMS && (
            <button
              type="button"
              className="btn-quiet py-1"
              onClick={() =>
                change('add a team', (d) => {
                  const id = freeKey(`team ${d.teams.length + 1}`, d.teams.map((t) => t.id));
                  return { ...d, teams: [...d.teams, { id, name: `Team ${d.teams.length + 1}`, objectives: [] }], weights: { ...d.weights, [id]: {} } };
                })
              }
            >
              Add a team
            </button>
          )}
        </div>
        <p className="text-xs text-ink-600">A team’s private brief is shown only to that team’s players and to the facilitators.</p>
        {document.teams.map((team, index) => (
          <article key={team.id} className="space-y-2 rounded-md border border-ink-200 p-3" aria-label={`Team ${team.name}`}>
            <div className="flex flex-wrap items-end gap-3">
              <TextField className="min-w-48 flex-1" label="Name" value={team.name} onChange={(name) => setTeam(index, `rename team ${team.id}`, { name })} readOnly={readOnly} required />
              <span className="pb-2 font-mono text-xs text-ink-500" title="The team's id in the tree and in files">
                id {team.id}
              </span>
              {!readOnly && document.teams.length > 2 && (
                <button
                  type="button"
                  className="btn-danger py-1"
                  onClick={() =>
                    change(`remove team ${team.id}`, (d) => {
                      const { [team.id]: _gone, ...weights } = d.weights;
                      return { ...d, teams: d.teams.filter((t) => t.id !== team.id), weights };
                    })
                  }
                >
                  Remove
                </button>
              )}
            </div>
            <ObjectivesField objectives={team.objectives} readOnly={readOnly} onChange={(objectives) => setTeam(index, `edit objectives of ${team.id}`, { objectives })} />
            <div>
              <span className="field-label">Private brief of {team.name}</span>
              <RichText
                id={`brief-${team.id}`}
                label={`Private brief of ${team.name}`}
                value={(team.brief as JSONContent | undefined) ?? null}
                onChange={(brief) => setTeam(index, `edit the brief of ${team.id}`, { brief: brief as RichTextValue })}
                readOnly={readOnly}
              />
            </div>
          </article>
        ))}
      </section>

      <AttributesAndWeights />
    </div>
  );
}

/** One objective a line; blank lines stay in the box while typing but are not objectives. */
function ObjectivesField({ objectives, onChange, readOnly }: { objectives: string[]; onChange: (objectives: string[]) => void; readOnly: boolean }) {
  const [text, setText] = useState(objectives.join('\n'));
  const lines = (value: string) => value.split('\n').map((l) => l.trim().slice(0, 1000)).filter(Boolean);
  useEffect(() => {
    setText((typed) => (lines(typed).join('\n') === objectives.join('\n') ? typed : objectives.join('\n')));
  }, [objectives]);
  return (
    <TextField
      label="Objectives (one per line)"
      value={text}
      readOnly={readOnly}
      multiline
      onChange={(value) => {
        setText(value);
        onChange(lines(value));
      }}
    />
  );
}

function AttributesAndWeights() {
  const { document, change, readOnly } = useWorkbench();
  const setAttribute = (index: number, label: string, patch: Partial<Attribute>) =>
    change(label, (d) => ({ ...d, attributes: d.attributes.map((a, i) => (i === index ? { ...a, ...patch } : a)) }));
  return (
    <section className="panel space-y-3 p-4 xl:col-span-2" aria-labelledby="overview-attributes">
      <div className="flex items-center justify-between">
        <h2 id="overview-attributes">What the teams care about</h2>
        {!readOnly && (
          <button
            type="button"
            className="btn-quiet py-1"
            onClick={() =>
              change('add an attribute', (d) => ({
                ...d,
                attributes: [...d.attributes, { key: freeKey(`attribute ${d.attributes.length + 1}`, d.attributes.map((a) => a.key)), label: `Attribute ${d.attributes.length + 1}`, direction: 'more-is-better' }],
              }))
            }
          >
            Add an attribute
          </button>
        )}
      </div>
      <p className="text-xs text-ink-600">
        Each outcome is described by these attributes. A team scores an outcome as the sum of its weight times the attribute, with the sign
        turned for attributes where less is better. The weights are assumptions: change them and see how the analysis moves.
      </p>
      {document.attributes.length === 0 ? (
        <p className="rounded-md border border-dashed border-ink-300 p-4 text-sm text-ink-600">
          No attributes yet. Add one (cost, casualties, territory, credibility…) or give outcomes direct payoffs in the Outcomes tab.
        </p>
      ) : (
        <div className="overflow-x-auto">
          <table className="data-table" data-testid="weights-table">
            <thead>
              <tr>
                <th>Attribute</th>
                <th>Unit</th>
                <th>Better when</th>
                {document.teams.map((t) => (
                  <th key={t.id}>Weight for {t.name}</th>
                ))}
                <th />
              </tr>
            </thead>
            <tbody>
              {document.attributes.map((attribute, index) => (
                <tr key={attribute.key}>
                  <td>
                    <TextField label={`Name of attribute ${attribute.key}`} showLabel={false} value={attribute.label} onChange={(label) => setAttribute(index, `rename ${attribute.key}`, { label })} readOnly={readOnly} required />
                    <span className="font-mono text-[11px] text-ink-500">{attribute.key}</span>
                  </td>
                  <td>
                    <TextField label={`Unit of ${attribute.label}`} showLabel={false} value={attribute.unit ?? ''} onChange={(unit) => setAttribute(index, `unit of ${attribute.key}`, unit ? { unit } : { unit: undefined })} readOnly={readOnly} />
                  </td>
                  <td>
                    <select
                      className="field-input py-1"
                      aria-label={`Direction of ${attribute.label}`}
                      value={attribute.direction}
                      disabled={readOnly}
                      onChange={(e) => setAttribute(index, `direction of ${attribute.key}`, { direction: e.target.value as Attribute['direction'] })}
                    >
                      <option value="more-is-better">more is better</option>
                      <option value="less-is-better">less is better</option>
                    </select>
                  </td>
                  {document.teams.map((team) => (
                    <td key={team.id}>
                      <NumField
                        label={`Weight of ${attribute.label} for ${team.name}`}
                        value={document.weights[team.id]?.[attribute.key]}
                        readOnly={readOnly}
                        className="w-20"
                        onChange={(value) => change(`weight ${team.id} ${attribute.key}`, (d) => ({ ...d, weights: { ...d.weights, [team.id]: { ...d.weights[team.id], [attribute.key]: value } } }))}
                        onClear={() =>
                          change(`weight ${team.id} ${attribute.key}`, (d) => {
                            const { [attribute.key]: _gone, ...rest } = d.weights[team.id] ?? {};
                            return { ...d, weights: { ...d.weights, [team.id]: rest } };
                          })
                        }
                      />
                    </td>
                  ))}
                  <td>
                    {!readOnly && (
                      <button type="button" className="btn-quiet py-1" aria-label={`Remove attribute ${attribute.label}`} onClick={() => change(`remove ${attribute.key}`, (d) => ({ ...d, attributes: d.attributes.filter((a) => a.key !== attribute.key) }))}>
                        Remove
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
