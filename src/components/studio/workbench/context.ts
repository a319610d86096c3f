/** What every tab of the workbench reads: the document being edited, its game, and the equilibria. */
import { createContext, useContext } from 'react';
import type { Equilibrium, Game, SubgamePerfectResult } from '../../../lib/engine';
import type { Scenario, ScenarioFault } from '../../../lib/scenario';
import type { RebuildReport } from '../../../lib/studio/regenerate';
import type { JobState } from '../analysis/useJob';

export type Change = (label: string, update: (document: Scenario) => Scenario) => void;

export type WorkbenchState = {
  scenarioId: string;
  document: Scenario;
  change: Change;
  /** What the last rebuild of the tree kept and could not keep. */
  rebuildReport: RebuildReport | null;
  readOnly: boolean;
  /** The engine's game of the document, or null while the document has faults of shape. */
  game: Game | null;
  faults: ScenarioFault[];
  /** Formatted payoffs per terminal id, in team order. */
  payoffs: Map<string, string[]>;
  equilibria: JobState<SubgamePerfectResult>;
  /** True while the result on hand was computed for an earlier state of the document (a change waits for its rerun). */
  equilibriumStale: boolean;
  /** The equilibrium shown (of those listed), or null until one is known. */
  equilibrium: Equilibrium | null;
  equilibriumIndex: number;
  setEquilibriumIndex: (index: number) => void;
  rerunEquilibria: () => void;
  cancelEquilibria: () => void;
  selectedNodeId: string | null;
  selectNode: (id: string | null) => void;
  /** Show a tab (e.g. the tree, at a node). */
  show: (tab: TabKey) => void;
};

export const TABS = [
  { key: 'overview', label: 'Overview' },
  { key: 'ladder', label: 'Ladder' },
  { key: 'tree', label: 'Tree' },
  { key: 'outcomes', label: 'Outcomes' },
  { key: 'analysis', label: 'Analysis' },
  { key: 'documents', label: 'Documents' },
  { key: 'history', label: 'History' },
] as const;

export type TabKey = (typeof TABS)[number]['key'];

export const Workbench = createContext<WorkbenchState | null>(null);

export function useWorkbench(): WorkbenchState {
  const state = useContext(Workbench);
  if (!state) throw new Error('useWorkbench outside the workbench');
  return state;
}
