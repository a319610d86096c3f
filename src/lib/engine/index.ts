/**
 * The Rungwise game engine: pure TypeScript, no I/O. The one public entry point.
 * Analysis results are assumptions in, numbers out: aids to discussion, not predictions.
 */
export * from './model';
export { EXACT_PATTERN, formatExact, parseExact, toExact, toFloat, type Num } from './numbers';
export { validateGame, formatPath, type Fault, type FaultCode, type Validated, type ValidateOptions } from './validate';
export { parsePlainGame } from './plain';
export { indexGame, nodeById, parentOf, pathTo, choiceKey, describeNode, hasImperfectInformation, type TreeIndex } from './tree';
export { ROOT_ID, childId, siblingKeys, slug } from './ids';
export { payoffScorer, terminalPayoffs } from './scoring';
export { compile, compiledGame, isPerfectInformation, CHANCE, TERMINAL, type FlatGame } from './compile';
export { buildLadder, checkLadder, LadderSpecSchema, type LadderSpec, type BuiltLadder } from './ladder';
export { stageAt, advance, drawChance, simultaneousStage, PlayError, type Stage, type Moves, type ActionView, type RungView, type StageMover } from './play';
export { mulberry32, type Rng } from './rng';
export { actionValues, equilibriumPath, reachesNode, type Equilibrium, type NodeActionValues, type ActionValue, type PathStep } from './profile';
export { backwardInduction, solveFlat, NO_CHOICE, type BackwardInductionResult, type DecisionAnalysis, type FlatSolution } from './solvers/backward-induction';
export { solveSubgamePerfect, type SubgamePerfectResult, type StageCounts } from './solvers/subgame-perfect';
export { PLAY_PAYOFFS_LISTED, type EquilibriumPlays, type PlayPayoffs } from './enumeration';
export { equilibriumCountPhrase, equilibriumCountWords, equilibriumCounts, hasSeveralPlays, type EquilibriumCounts } from './count-words';
export { supportEnumeration, type BimatrixGame, type MixedEquilibrium, type SupportEnumerationResult } from './solvers/support-enumeration';
export { MethodDoesNotApply } from './solvers/pure-enumeration';
export { RayTermination } from './solvers/sequence-form';
export { assessMarks, type Mark, type MarkKind, type CredibilityVerdict } from './solvers/credibility';
export { logitQre, qreFlat, type QreResult, type QreOptions, type Progress } from './solvers/qre';
export { fitLogit, trembleLogLikelihood, LAMBDA_RANGE, FIT_TOLERANCE, type Observation, type LogitFit, type TeamFit, type TrembleLikelihood } from './solvers/logit-fit';
export { sensitivity, type PayoffInterval, type SensitivityResult } from './solvers/sensitivity';
export { monteCarlo, sampleDistribution, type PayoffRange, type PayoffDistribution, type MonteCarloResult, type OutcomeShare } from './solvers/monte-carlo';
export { ewlOutcome, ewlEquilibria, ewlCurves, EWL_C, EWL_D, EWL_Q, type TwoByTwo, type EwlStrategy, type EwlEquilibrium, type EwlCurve } from './solvers/ewl';
export { quarterLaw, beliefForecast, QUARTER, type QuarterLawForecast, type BeliefForecast } from './solvers/quarter-law';
export { runAnalysis, InvalidGame, type AnalysisJob, type AnalysisName } from './jobs';
