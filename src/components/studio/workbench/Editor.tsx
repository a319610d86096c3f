/**
 * The editor of one scenario version: the document with undo and redo, saving
 * under the freeze rule, local checks, the equilibria kept up to date on the
 * server, and the tabs.
 */
import { useCallback, useDeferredValue, useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { payoffScorer, type Game, type SubgamePerfectResult, type TerminalNode } from '../../../lib/engine';
import { api, ApiError, describeError, type FieldError } from '../../../lib/client/api';
import { parseScenario, scenarioGame, type Scenario } from '../../../lib/scenario';
import type { Saved } from '../../../lib/studio/library';
import { withTreeInStep, type RebuildReport } from '../../../lib/studio/regenerate';
import { useJob } from '../analysis/useJob';
import { downloadBlob } from '../download';
import { FaultList } from '../FaultList';
import { TABS, Workbench as WorkbenchContext, type TabKey, type WorkbenchState } from './context';
import { formatNumber } from './format';
import { useDocumentHistory } from './history';
import type { Detail, VersionView } from './Workbench';
import { OverviewTab } from './OverviewTab';
import { LadderTab } from './LadderTab';
import { TreeTab } from './TreeTab';
import { OutcomesTab } from './OutcomesTab';
import { AnalysisTab } from './AnalysisTab';
import { DocumentsTab } from './DocumentsTab';
import { HistoryTab } from './HistoryTab';

type Props = {
  scenarioId: string;
  detail: Detail;
  view: VersionView;
  openVersion: (id: string) => void;
  refreshDetail: () => void;
};

type Meta = { versionId: string; number: number; status: 'draft' | 'frozen'; revision: number };

/** What the last rebuild of the tree reported, by the document it produced (updates stay pure). */
const rebuildReports = new WeakMap<Scenario, RebuildReport>();

function payoffTexts(game: Game | null): Map<string, string[]> {
  const out = new Map<string, string[]>();
  if (!game) return out;
  const score = payoffScorer(game);
  const stack = [game.root];
  while (stack.length > 0) {
    const node = stack.pop()!;
    if (node.kind === 'terminal') {
      try {
        out.set(node.id, score(node as TerminalNode).map((f) => formatNumber(f.valueOf())));
      } catch {
        out.set(node.id, game.teams.map(() => '?'));
      }
    } else for (const e of node.kind === 'decision' ? node.actions : node.outcomes) stack.push(e.next);
  }
  return out;
}

const fileName = (title: string) => `${title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'scenario'}.rungwise.json`;

const isTyping = (target: EventTarget | null) =>
  target instanceof HTMLElement && (target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName));

export function Editor({ scenarioId, detail, view, openVersion, refreshDetail }: Props) {
  const history = useDocumentHistory(view.document);
  const [meta, setMeta] = useState<Meta>({ versionId: view.version.id, number: view.version.number, status: view.version.status, revision: view.version.revision });
  const [ladderDraft, setLadderDraft] = useState<unknown>(view.ladderDraft);
  const [tab, setTab] = useState<TabKey>(() => (TABS.some((t) => `#${t.key}` === window.location.hash) ? (window.location.hash.slice(1) as TabKey) : 'overview'));
  const [selectedNodeId, selectNode] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<{ message: string; fields: FieldError[]; conflict: boolean } | null>(null);
  const [saving, setSaving] = useState(false);
  const readOnly = !detail.scenario.canEdit || !view.latest;
  const document = history.document;
  const checked = useDeferredValue(document);

  const faults = useMemo(() => {
    const parsed = parseScenario(checked);
    return parsed.ok ? [] : parsed.faults;
  }, [checked]);
  const game = useMemo(() => scenarioGame(checked), [checked]);
  const payoffs = useMemo(() => payoffTexts(game), [game]);

  const spe = useJob<SubgamePerfectResult>(scenarioId);
  const [equilibriumIndex, setEquilibriumIndex] = useState(0);
  // The document the current job was started for: a change reruns the job after a pause,
  // and until then the panel marks the result on hand as left over from before it.
  const [analysedFor, setAnalysedFor] = useState<Scenario | null>(null);
  const rerunEquilibria = useCallback(() => {
    setAnalysedFor(checked);
    void spe.start(checked, { analysis: 'equilibria', maxListed: 8 });
  }, [checked, spe.start]);
  useEffect(() => {
    if (faults.length > 0 || analysedFor === checked) return;
    const timer = setTimeout(rerunEquilibria, 350);
    return () => clearTimeout(timer);
  }, [checked, faults, analysedFor, rerunEquilibria]);
  const result = spe.state.status === 'done' ? spe.state.result : null;
  const equilibriumStale = result !== null && faults.length === 0 && analysedFor !== document;
  const equilibrium = result?.equilibria[Math.min(equilibriumIndex, result.equilibria.length - 1)] ?? null;

  const save = useCallback(async () => {
    if (readOnly || saving) return;
    setSaving(true);
    setSaveError(null);
    const sent = document;
    try {
      const saved = await api<Saved>(`/api/scenarios/${scenarioId}/versions/${meta.versionId}`, {
        method: 'PUT',
        json: { revision: meta.revision, document: sent, ladderDraft: ladderDraft ?? null },
      });
      setMeta({ versionId: saved.versionId, number: saved.number, status: 'draft', revision: saved.revision });
      history.markSaved(sent);
      setNotice(saved.startedDraft ? `Saved as version ${saved.number}, a new draft: version ${meta.number} stays frozen for the exercises that use it.` : `Saved. ${saved.summary}.`);
      if (saved.startedDraft) refreshDetail();
    } catch (error) {
      setSaveError({
        message: describeError(error),
        fields: error instanceof ApiError ? error.fields : [],
        conflict: error instanceof ApiError && error.status === 409,
      });
    } finally {
      setSaving(false);
    }
  }, [readOnly, saving, document, scenarioId, meta, ladderDraft, history, refreshDetail]);

  useEffect(() => {
    const onKey = (event: globalThis.KeyboardEvent) => {
      const mod = event.ctrlKey || event.metaKey;
      if (!mod) return;
      if (event.key === 's') {
        event.preventDefault();
        void save();
      } else if (!isTyping(event.target) && event.key.toLowerCase() === 'z') {
        event.preventDefault();
        if (event.shiftKey) history.redo();
        else history.undo();
      } else if (!isTyping(event.target) && event.key === 'y') {
        event.preventDefault();
        history.redo();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [save, history]);

  useEffect(() => {
    if (!history.dirty) return;
    const warn = (event: BeforeUnloadEvent) => event.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [history.dirty]);

  // A link or a typed address to another tab (#outcomes, #analysis...) opens it.
  useEffect(() => {
    const onHash = () => {
      const key = window.location.hash.slice(1);
      if (TABS.some((t) => t.key === key)) setTab(key as TabKey);
    };
    window.addEventListener('hashchange', onHash);
    return () => window.removeEventListener('hashchange', onHash);
  }, []);

  const show = useCallback((next: TabKey) => {
    setTab(next);
    window.history.replaceState(null, '', `#${next}`);
  }, []);

  const change = useCallback<WorkbenchState['change']>(
    (label, update) =>
      history.change(label, (previous) => {
        const { document: next, report } = withTreeInStep(previous, update(previous));
        if (report) rebuildReports.set(next, report);
        return next;
      }),
    [history.change],
  );
  const lastReport = useRef<RebuildReport | null>(null);
  lastReport.current = rebuildReports.get(document) ?? lastReport.current;

  const state: WorkbenchState = {
    scenarioId,
    document,
    change,
    rebuildReport: lastReport.current,
    readOnly,
    game,
    faults,
    payoffs,
    equilibria: spe.state,
    equilibriumStale,
    equilibrium,
    equilibriumIndex,
    setEquilibriumIndex,
    rerunEquilibria,
    cancelEquilibria: spe.cancel,
    selectedNodeId,
    selectNode,
    show,
  };

  const exportFile = () => downloadBlob(new Blob([`${JSON.stringify(document, null, 2)}\n`], { type: 'application/json' }), fileName(document.title));

  const onTabKey = (event: KeyboardEvent<HTMLDivElement>) => {
    const at = TABS.findIndex((t) => t.key === tab);
    const step = event.key === 'ArrowRight' ? 1 : event.key === 'ArrowLeft' ? -1 : 0;
    if (step === 0) return;
    event.preventDefault();
    const next = TABS[(at + step + TABS.length) % TABS.length]!.key;
    show(next);
    globalThis.document.getElementById(`tab-${next}`)?.focus();
  };

  return (
    <WorkbenchContext.Provider value={state}>
      <div className="space-y-3" data-testid="workbench">
        <header className="flex flex-wrap items-start gap-3">
          <div className="min-w-0 flex-1">
            <p className="text-xs font-medium tracking-wide text-ink-500 uppercase">
              <a href="/studio">Studio</a> · scenario by {detail.scenario.ownerName}
            </p>
            <h1 className="truncate" data-testid="scenario-title">
              {document.title}
            </h1>
            <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-ink-700">
              <span className={`tag ${meta.status === 'frozen' ? 'bg-haze-100 text-haze-700' : 'bg-ink-100 text-ink-700'}`} data-testid="version-tag">
                version {meta.number} · {meta.status}
              </span>
              {readOnly && <span className="tag bg-paper-deep text-ink-700">read only</span>}
              <span data-testid="save-state">{history.dirty ? 'Unsaved changes' : 'All changes saved'}</span>
              {faults.length > 0 && (
                <a href="#faults" className="text-brick-700">
                  {faults.length === 1 ? '1 fault' : `${faults.length} faults`} to fix
                </a>
              )}
            </p>
          </div>
          <div className="flex flex-wrap items-center gap-2" role="toolbar" aria-label="Scenario commands">
            <button type="button" className="btn-quiet" disabled={!history.canUndo || readOnly} onClick={history.undo} title={history.undoLabel ? `Undo: ${history.undoLabel} (Ctrl+Z)` : 'Nothing to undo'}>
              Undo
            </button>
            <button type="button" className="btn-quiet" disabled={!history.canRedo || readOnly} onClick={history.redo} title={history.redoLabel ? `Redo: ${history.redoLabel} (Ctrl+Shift+Z)` : 'Nothing to redo'}>
              Redo
            </button>
            <button type="button" className="btn-quiet" onClick={exportFile}>
              Export JSON
            </button>
            {!readOnly && (
              <button type="button" className="btn-accent" disabled={saving || (!history.dirty && ladderDraft === view.ladderDraft)} onClick={() => void save()} title="Save (Ctrl+S)">
                {saving ? 'Saving…' : 'Save'}
              </button>
            )}
          </div>
        </header>

        {!view.latest && (
          <div className="rounded-md border border-haze-700 bg-haze-100 px-3 py-2 text-sm text-haze-700" role="note">
            You are looking at version {meta.number}, an older version. It cannot be edited.{' '}
            <button type="button" className="underline" onClick={() => openVersion(detail.versions[0]!.id)}>
              Open the latest version
            </button>
          </div>
        )}
        {view.latest && meta.status === 'frozen' && !readOnly && (
          <div className="rounded-md border border-haze-700 bg-haze-100 px-3 py-2 text-sm text-haze-700" role="note" data-testid="frozen-note">
            Version {meta.number} is frozen: exercises may use it, so it never changes. Saving your edits starts version {meta.number + 1} as a new draft.
          </div>
        )}
        {notice && (
          <div role="status" className="flex items-center justify-between rounded-md border border-moss-600 bg-moss-100 px-3 py-2 text-sm text-moss-700">
            <span>{notice}</span>
            <button type="button" className="text-xs underline" onClick={() => setNotice(null)}>
              Dismiss
            </button>
          </div>
        )}
        {saveError && (
          <div className="space-y-2">
            {saveError.fields.length > 0 ? (
              <FaultList title={saveError.message} faults={saveError.fields} />
            ) : (
              <p role="alert" className="rounded-md border border-brick-600 bg-brick-100 px-3 py-2 text-sm text-brick-700">
                {saveError.message}
              </p>
            )}
            {saveError.conflict && (
              <button type="button" className="btn-quiet" onClick={exportFile}>
                Download my edits as JSON
              </button>
            )}
          </div>
        )}

        <div role="tablist" aria-label="Scenario parts" className="flex flex-wrap gap-1 border-b border-ink-200" onKeyDown={onTabKey}>
          {TABS.map((t) => (
            <button
              key={t.key}
              id={`tab-${t.key}`}
              type="button"
              role="tab"
              aria-selected={tab === t.key}
              aria-controls={`panel-${t.key}`}
              tabIndex={tab === t.key ? 0 : -1}
              className={`-mb-px rounded-t-md border px-3 py-1.5 text-sm font-medium ${tab === t.key ? 'border-ink-200 border-b-white bg-white text-ink-950' : 'border-transparent text-ink-600 hover:text-ink-900'}`}
              onClick={() => show(t.key)}
            >
              {t.label}
            </button>
          ))}
        </div>

        <section id={`panel-${tab}`} role="tabpanel" aria-labelledby={`tab-${tab}`} className="min-h-[28rem]">
          {tab === 'overview' && <OverviewTab />}
          {tab === 'ladder' && <LadderTab ladderDraft={ladderDraft} setLadderDraft={setLadderDraft} />}
          {tab === 'tree' && <TreeTab />}
          {tab === 'outcomes' && <OutcomesTab />}
          {tab === 'analysis' && <AnalysisTab />}
          {tab === 'documents' && <DocumentsTab versionId={meta.versionId} onChanged={(change) => {
            setMeta((m) => ({ ...m, versionId: change.versionId, revision: change.revision, status: 'draft', number: change.startedDraft ? m.number + 1 : m.number }));
            history.serverChange((d) => ({ ...d, attachments: change.attachments }));
            if (change.startedDraft) refreshDetail();
          }} />}
          {tab === 'history' && <HistoryTab detail={detail} versionId={meta.versionId} status={meta.status} openVersion={openVersion} onFrozen={() => { setMeta((m) => ({ ...m, status: 'frozen' })); refreshDetail(); }} dirty={history.dirty} />}
        </section>

        <div id="faults">
          <FaultList title="Faults to fix before this version can be analysed or used in an exercise" faults={faults.map((f) => ({ field: f.path, reason: f.message }))} />
        </div>
      </div>
    </WorkbenchContext.Provider>
  );
}
