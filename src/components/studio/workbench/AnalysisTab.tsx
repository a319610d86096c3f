/** The analysis beside the game: every panel on the current document, saved or not. */
import { AgreementPanel, BeliefPanel } from '../analysis/stages';
import { ForecastPanel, MarksPanel, MonteCarloPanel, SensitivityPanel } from '../analysis/panels';
import { useWorkbench } from './context';
import { EquilibriumStatus } from './EquilibriumStatus';

export function AnalysisTab() {
  const { faults } = useWorkbench();
  return (
    <div className="space-y-4">
      <p className="rounded-md border border-ink-200 bg-paper-deep px-3 py-2 text-sm text-ink-700" role="note">
        Every figure here follows from the payoffs and probabilities assumed in this scenario. It is an aid to discussion, not a prediction of what any
        government will do. Analyses run on the version you have open, including unsaved changes{faults.length > 0 ? ', once its faults are fixed' : ''}.
      </p>
      <div className="grid gap-4 xl:grid-cols-2">
        <div className="space-y-4">
          <EquilibriumStatus />
          <MarksPanel />
          <SensitivityPanel />
        </div>
        <div className="space-y-4">
          <MonteCarloPanel />
          <AgreementPanel />
          <ForecastPanel />
          <BeliefPanel />
        </div>
      </div>
    </div>
  );
}
