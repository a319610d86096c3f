/**
 * The tree: the canvas with the equilibrium path, and beside it the selected
 * node: what each action is worth under the equilibrium, and the hand edits
 * (movers, information sets, actions, probabilities, payoffs).
 */
import { useEffect, useMemo, useState } from 'react';
import { actionValues, choiceKey, childEdges, indexGame, type GameNode, type NodeActionValues, type QreResult } from '../../../lib/engine';
import { applyEdit, type TreeEdit } from '../../../lib/studio/tree-edits';
import { useJob } from '../analysis/useJob';
import { TreeCanvas } from '../tree/TreeCanvas';
import { useWorkbench } from './context';
import { AnalysisCaution, NumField, TextField } from './fields';
import { formatNumber, formatPercent } from './format';
import { EquilibriumStatus } from './EquilibriumStatus';
import { SubmitButton } from '../../ui/SubmitButton';

export function TreeTab() {
  const { document, game, payoffs, equilibrium, selectedNodeId, selectNode, scenarioId } = useWorkbench();
  const path = useMemo(() => new Set(equilibrium?.pathNodes ?? []), [equilibrium]);
  const forecast = useForecast(scenarioId);
  const teams = useMemo(() => document.teams.map((t) => ({ id: t.id, name: t.name, ...(t.colour ? { colour: t.colour } : {}) })), [document.teams]);
  const edgeNotes = useMemo(() => (forecast.result ? forecastNotes(document.tree, forecast.result) : undefined), [forecast.result, document.tree]);
  if (!game) return null;
  return (
    <div className="grid gap-3 lg:grid-cols-[minmax(0,1fr)_24rem]">
      <div className="panel flex h-[72vh] min-h-[30rem] flex-col overflow-hidden">
        <TreeCanvas root={document.tree} teams={teams} payoffs={payoffs} path={path} edgeNotes={edgeNotes} selectedId={selectedNodeId} onSelect={selectNode} title={document.title}>
          <label className="ml-2 flex items-center gap-2 text-xs text-ink-700">
            <input type="checkbox" checked={forecast.on} onChange={(e) => forecast.setOn(e.target.checked)} /> Behavioural forecast
          </label>
          {forecast.on && (
            <label className="flex items-center gap-2 text-xs text-ink-700">
              λ
              <input type="range" min={0} max={5} step={0.1} value={forecast.lambda} onChange={(e) => forecast.setLambda(Number(e.target.value))} aria-label="Rationality lambda of the forecast" />
              <span className="w-8 font-mono">{forecast.lambda.toFixed(1)}</span>
              {forecast.running && <span role="status">computing…</span>}
            </label>
          )}
        </TreeCanvas>
      </div>
      <aside className="space-y-3" aria-label="Selected node">
        <EquilibriumStatus />
        <NodePanel />
      </aside>
    </div>
  );
}

/** Logit QRE probabilities on the edges, at a lambda the author picks. */
function useForecast(scenarioId: string) {
  const { document, faults } = useWorkbench();
  const job = useJob<QreResult>(scenarioId);
  const [on, setOn] = useState(false);
  const [lambda, setLambda] = useState(1);
  useEffect(() => {
    if (!on || faults.length > 0) return;
    const timer = setTimeout(() => void job.start(document, { analysis: 'qre', lambda }), 250);
    return () => clearTimeout(timer);
  }, [on, lambda, document, faults.length, job.start]);
  return { on, setOn, lambda, setLambda, running: job.state.status === 'running', result: on && job.state.status === 'done' ? job.state.result : null };
}

function forecastNotes(root: GameNode, qre: QreResult): Map<string, string> {
  const notes = new Map<string, string>();
  const stack = [root];
  while (stack.length > 0) {
    const node = stack.pop()!;
    if (node.kind === 'decision') {
      const probs = qre.behaviour[choiceKey(node)];
      for (const a of node.actions) if (probs?.[a.label] !== undefined) notes.set(a.next.id, formatPercent(probs[a.label]!));
    }
    for (const e of childEdges(node)) stack.push(e.next);
  }
  return notes;
}

function NodePanel() {
  const { document, game, selectedNodeId } = useWorkbench();
  const index = useMemo(() => (game ? indexGame(game) : null), [game]);
  const node = selectedNodeId ? index?.byId.get(selectedNodeId) : undefined;
  if (!index || !node) {
    return (
      <div className="panel p-4 text-sm text-ink-600" data-empty="node">
        Select a node on the tree (click it, or focus the tree and use the arrow keys) to see what each action is worth and to edit it.
      </div>
    );
  }
  const labels: string[] = [];
  for (let link = index.parentOf.get(node); link; link = index.parentOf.get(link.parent)) labels.unshift(link.label);
  const team = node.kind === 'decision' ? document.teams.find((t) => t.id === node.team)?.name ?? node.team : null;
  return (
    <div className="panel space-y-3 p-4" data-testid="node-panel">
      <div>
        <p className="text-xs font-medium tracking-wide text-ink-500 uppercase">{node.kind === 'decision' ? `${team} decides` : node.kind === 'chance' ? 'Chance' : 'Outcome'}</p>
        <p className="text-sm text-ink-800">{labels.length === 0 ? 'At the start' : labels.join(' › ')}</p>
        <p className="font-mono text-[11px] text-ink-500">{node.id}</p>
      </div>
      {node.kind === 'decision' && <ActionWorth nodeId={node.id} />}
      <NodeEditor node={node} />
    </div>
  );
}

function ActionWorth({ nodeId }: { nodeId: string }) {
  const { document, game, equilibrium } = useWorkbench();
  const values: NodeActionValues | null = useMemo(() => {
    if (!game || !equilibrium) return null;
    try {
      return actionValues(game, equilibrium, nodeId);
    } catch {
      return null;
    }
  }, [game, equilibrium, nodeId]);
  if (!values) return <p className="text-xs text-ink-600">The action values appear once the equilibrium is computed.</p>;
  const mover = document.teams.findIndex((t) => t.id === values.team);
  const best = values.actions.find((a) => a.label === values.equilibriumAction)!;
  const runnerUp = Math.max(...values.actions.filter((a) => a !== best).map((a) => a.values[mover]!));
  return (
    <div className="space-y-1">
      <table className="data-table" data-testid="action-values">
        <thead>
          <tr>
            <th>Action</th>
            <th>Chosen</th>
            {document.teams.map((t) => (
              <th key={t.id}>{t.name}</th>
            ))}
          </tr>
        </thead>
        <tbody>
          {values.actions.map((a) => (
            <tr key={a.label} className={a.label === values.equilibriumAction ? 'bg-bronze-100' : ''}>
              <td>{a.label}</td>
              <td className="font-mono text-xs">{formatPercent(a.probability)}</td>
              {a.values.map((v, t) => (
                <td key={t} className={`font-mono text-xs ${t === mover ? 'font-semibold' : ''}`}>
                  {formatNumber(v)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {values.actions.length > 1 && (
        <p className="text-xs text-ink-700" data-testid="margin">
          Margin to the runner-up for {document.teams[mover]?.name}: <strong>{formatNumber(best.values[mover]! - runnerUp)}</strong>
          {best.values[mover]! - runnerUp === 0 ? ' (a tie: other equilibria choose differently here)' : ''}
        </p>
      )}
      <p className="text-xs text-ink-600">Values: what each team gets if this action is taken here and the equilibrium is followed afterwards.</p>
      <AnalysisCaution />
    </div>
  );
}

function blankNode(kind: GameNode['kind'], teams: string[]): GameNode {
  const terminal = (id: string): GameNode => ({ id, kind: 'terminal', payoffs: Object.fromEntries(teams.map((t) => [t, 0])) });
  if (kind === 'terminal') return terminal('x');
  if (kind === 'chance') return { id: 'x', kind: 'chance', outcomes: [{ label: 'One way', p: '1/2', next: terminal('x.a') }, { label: 'The other', p: '1/2', next: terminal('x.b') }] };
  return { id: 'x', kind: 'decision', team: teams[0]!, actions: [{ label: 'Act', next: terminal('x.a') }, { label: 'Wait', next: terminal('x.b') }] };
}

function NodeEditor({ node }: { node: GameNode }) {
  const { document, change, readOnly } = useWorkbench();
  const [problem, setProblem] = useState<string | null>(null);
  const [newAction, setNewAction] = useState('');
  useEffect(() => setProblem(null), [node.id]);
  if (readOnly) return null;
  const teamIds = document.teams.map((t) => t.id);
  const edit = (label: string, treeEdit: TreeEdit) => {
    const result = applyEdit(document.tree, treeEdit);
    if (!result.ok) {
      setProblem(result.reason);
      return;
    }
    setProblem(null);
    change(label, (d) => ({
      ...d,
      tree: result.root,
      // A mark names its action by label: follow a rename.
      marks: treeEdit.kind === 'rename' ? d.marks.map((m) => (m.nodeId === treeEdit.nodeId && m.action === treeEdit.label ? { ...m, action: treeEdit.to } : m)) : d.marks,
    }));
  };
  const mark = (action: string, kind: 'threat' | 'promise') =>
    change(`mark a ${kind}`, (d) => ({ ...d, marks: [...d.marks.filter((m) => !(m.nodeId === node.id && m.action === action)), { nodeId: node.id, action, kind }] }));

  return (
    <div className="space-y-3 border-t border-ink-100 pt-3">
      <h3 className="text-sm font-semibold">Edit this node</h3>
      {problem && (
        <p role="alert" className="text-sm text-brick-700">
          {problem}
        </p>
      )}
      {node.kind === 'decision' && (
        <>
          <div className="grid grid-cols-2 gap-2">
            <label className="block text-sm">
              <span className="field-label">Team to move</span>
              <select className="field-input py-1" value={node.team} onChange={(e) => edit('change the mover', { kind: 'mover', nodeId: node.id, team: e.target.value })}>
                {document.teams.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </select>
            </label>
            <TextField
              label="Information set"
              value={node.infoset ?? ''}
              hint="Nodes with the same set cannot be told apart by the team moving there."
              onChange={(infoset) => edit('group into an information set', { kind: 'infoset', nodeId: node.id, infoset: infoset.trim() === '' ? null : infoset.trim() })}
            />
          </div>
          <ActionList node={node} edit={edit} mark={mark} />
        </>
      )}
      {node.kind === 'chance' && (
        <div className="space-y-1">
          {node.outcomes.map((o) => (
            <div key={o.next.id} className="flex items-start gap-2">
              <TextField className="flex-1" label={`Name of chance outcome ${o.label}`} showLabel={false} value={o.label} onChange={(to) => to.trim() && edit('rename an outcome', { kind: 'rename', nodeId: node.id, childId: o.next.id, label: o.label, to })} />
              <NumField label={`Probability of ${o.label}`} value={o.p} className="w-20" onChange={(p) => edit('set a probability', { kind: 'probability', nodeId: node.id, childId: o.next.id, label: o.label, p })} />
              <button type="button" className="btn-quiet px-2 py-1" aria-label={`Remove ${o.label}`} onClick={() => edit('remove an outcome', { kind: 'remove-action', nodeId: node.id, childId: o.next.id, label: o.label })}>
                ✕
              </button>
            </div>
          ))}
          <p className="text-xs text-ink-600">Probabilities must add up to 1.</p>
        </div>
      )}
      {node.kind === 'terminal' && <TerminalEditor node={node} edit={edit} />}
      {node.kind !== 'terminal' && (
        <form
          className="flex items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!newAction.trim()) return;
            edit('add an action', { kind: 'add-action', nodeId: node.id, label: newAction.trim(), next: blankNode('terminal', teamIds) });
            setNewAction('');
          }}
        >
          <TextField className="flex-1" label={node.kind === 'chance' ? 'New chance outcome' : 'New action'} value={newAction} onChange={setNewAction} />
          <SubmitButton className="btn-quiet py-1.5">
            Add
          </SubmitButton>
        </form>
      )}
      <div className="flex flex-wrap gap-2">
        <span className="text-xs text-ink-600">Replace with:</span>
        {(['decision', 'chance', 'terminal'] as const)
          .filter((k) => k !== node.kind)
          .map((k) => (
            <button key={k} type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => edit(`turn into a ${k} node`, { kind: 'replace', nodeId: node.id, node: blankNode(k, teamIds) })}>
              {k === 'terminal' ? 'an outcome' : `a ${k} node`}
            </button>
          ))}
      </div>
    </div>
  );
}

function ActionList({ node, edit, mark }: { node: Extract<GameNode, { kind: 'decision' }>; edit: (label: string, e: TreeEdit) => void; mark: (action: string, kind: 'threat' | 'promise') => void }) {
  const { document } = useWorkbench();
  const markOf = (label: string) => document.marks.find((m) => m.nodeId === node.id && m.action === label);
  return (
    <ul className="space-y-1" aria-label="Actions">
      {node.actions.map((a) => {
        const marked = markOf(a.label);
        return (
          <li key={a.next.id} className="flex items-start gap-1">
            <TextField className="flex-1" label={`Name of action ${a.label}`} showLabel={false} value={a.label} onChange={(to) => to.trim() && edit('rename an action', { kind: 'rename', nodeId: node.id, childId: a.next.id, label: a.label, to })} />
            <select
              className="field-input w-24 px-1 py-1 text-xs"
              aria-label={`Mark ${a.label} as a threat or promise`}
              value={marked?.kind ?? ''}
              onChange={(e) => (e.target.value ? mark(a.label, e.target.value as 'threat' | 'promise') : undefined)}
            >
              <option value="">no mark</option>
              <option value="threat">threat</option>
              <option value="promise">promise</option>
            </select>
            <button type="button" className="btn-quiet px-2 py-1" aria-label={`Remove ${a.label}`} onClick={() => edit('remove an action', { kind: 'remove-action', nodeId: node.id, childId: a.next.id, label: a.label })}>
              ✕
            </button>
          </li>
        );
      })}
    </ul>
  );
}

function TerminalEditor({ node, edit }: { node: Extract<GameNode, { kind: 'terminal' }>; edit: (label: string, e: TreeEdit) => void }) {
  const { document, payoffs } = useWorkbench();
  const scored = payoffs.get(node.id) ?? [];
  return (
    <div className="space-y-2">
      <TextField label="How it ends" value={node.outcome ?? ''} onChange={(text) => edit('describe the outcome', { kind: 'outcome-text', nodeId: node.id, text })} />
      <table className="data-table">
        <thead>
          <tr>
            <th>Team</th>
            <th>Payoff</th>
            <th>Set by hand</th>
          </tr>
        </thead>
        <tbody>
          {document.teams.map((t, i) => (
            <tr key={t.id}>
              <td>{t.name}</td>
              <td className="font-mono text-xs">{scored[i]}</td>
              <td>
                <NumField
                  label={`Payoff of ${t.name} set by hand`}
                  value={node.payoffs?.[t.id]}
                  className="w-20"
                  onChange={(value) => edit(`payoff of ${t.id} at ${node.id}`, { kind: 'payoff', nodeId: node.id, team: t.id, value })}
                  onClear={() => edit(`payoff of ${t.id} at ${node.id}`, { kind: 'payoff', nodeId: node.id, team: t.id, value: null })}
                />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="text-xs text-ink-600">An empty hand-set payoff means the team scores the outcome from its attributes and weights.</p>
      {document.attributes.length > 0 && (
        <div className="grid grid-cols-2 gap-2">
          {document.attributes.map((a) => (
            <NumField
              key={a.key}
              showLabel
              label={`${a.label}${a.unit ? ` (${a.unit})` : ''}`}
              value={node.attributes?.[a.key]}
              onChange={(value) => edit(`${a.key} at ${node.id}`, { kind: 'attribute', nodeId: node.id, key: a.key, value })}
              onClear={() => edit(`${a.key} at ${node.id}`, { kind: 'attribute', nodeId: node.id, key: a.key, value: null })}
            />
          ))}
        </div>
      )}
    </div>
  );
}
