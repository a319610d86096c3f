/** The subgame-perfect equilibria of the document: progress while computing, then the path and the switch between equilibria. */
import { useWorkbench } from './context';
import { AnalysisCaution } from './fields';
import { formatNumber } from './format';
import { equilibriumCountWords, hasSeveralPlays, type SubgamePerfectResult } from '../../../lib/engine';
import { ProgressBar } from '../analysis/ProgressBar';
import type { JobState } from '../analysis/useJob';

export function EquilibriumStatus() {
  const { document, equilibria, equilibriumStale, equilibrium, equilibriumIndex, setEquilibriumIndex, rerunEquilibria, cancelEquilibria, faults } = useWorkbench();
  if (faults.length > 0 && equilibria.status !== 'done') {
    return <div className="panel p-4 text-sm text-ink-700">Fix the faults listed below the tabs, and the equilibrium appears here.</div>;
  }
  return (
    <section className="panel space-y-2 p-4" aria-labelledby="equilibrium-heading" data-testid="equilibrium-panel" data-state={panelState(equilibria.status, equilibriumStale, faults.length > 0)}>
      <h2 id="equilibrium-heading" className="text-base">
        Equilibrium path
      </h2>
      {equilibria.status === 'running' && <ProgressBar fraction={equilibria.fraction} phase={equilibria.phase} onCancel={cancelEquilibria} />}
      {(equilibria.status === 'cancelled' || equilibria.status === 'idle') && (
        <button type="button" className="btn-quiet py-1" onClick={rerunEquilibria}>
          Compute the equilibria
        </button>
      )}
      {equilibria.status === 'failed' && (
        <div role="alert" className="text-sm text-brick-700">
          {equilibria.message}{' '}
          <button type="button" className="underline" onClick={rerunEquilibria}>
            Try again
          </button>
        </div>
      )}
      {equilibria.status === 'done' && equilibrium && (
        <>
          {faults.length > 0 && <p className="text-xs text-bronze-800">Shown for the last version without faults.</p>}
          {equilibriumStale && (
            <p role="status" className="text-xs text-bronze-800">
              Recomputing for your latest change…
            </p>
          )}
          <p className="text-xs text-ink-600" data-testid="equilibrium-count">
            {equilibriumCountWords(equilibria.result)}.{continuaWords(equilibria.result)} · {equilibria.result.method} · {equilibria.seconds.toFixed(2)} s
          </p>
          {equilibria.result.equilibria.length > 1 && (
            <label className="flex items-center gap-2 text-sm">
              Show
              <select className="field-input w-auto py-1" value={equilibriumIndex} onChange={(e) => setEquilibriumIndex(Number(e.target.value))} aria-label="Equilibrium shown">
                {equilibria.result.equilibria.map((_, i) => (
                  <option key={i} value={i}>
                    strategy profile {i + 1} of {equilibria.result.equilibria.length} listed{hasSeveralPlays(equilibria.result) ? '' : ' (same play)'}
                  </option>
                ))}
              </select>
            </label>
          )}
          <ol className={`list-decimal space-y-0.5 pl-5 text-sm ${equilibriumStale ? 'opacity-60' : ''}`} data-testid="equilibrium-path">
            {equilibrium.path.map((label, i) => (
              <li key={`${i}-${label}`}>{label}</li>
            ))}
          </ol>
          <p className={`text-sm ${equilibriumStale ? 'opacity-60' : ''}`} data-testid="equilibrium-payoffs">
            Payoffs: {document.teams.map((t, i) => `${t.name} ${formatNumber(equilibrium.payoffs[i] ?? NaN)}`).join(' · ')}
          </p>
          <AnalysisCaution />
        </>
      )}
    </section>
  );
}

/** For tests and styles: 'current' only when the path shown belongs to the document as it stands. */
function panelState(status: JobState<SubgamePerfectResult>['status'], stale: boolean, faults: boolean): string {
  if (status !== 'done') return status;
  return faults ? 'faults' : stale ? 'stale' : 'current';
}

function continuaWords(result: SubgamePerfectResult): string {
  if (!result.continua) return '';
  return result.playsExact ? ' Some stages off the path have whole ranges of equilibria between those counted.' : ' Some stages have whole ranges of equilibria between those counted.';
}
