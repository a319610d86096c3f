/** Everything Review takes from the game engine, in one place. */
export { childEdges, type Game, type GameNode, type DecisionNode, type TerminalNode, type Rung } from '../engine/model';
export { choiceKey, indexGame, nodeById } from '../engine/tree';
export { actionValues, type Equilibrium } from '../engine/profile';
export { payoffScorer } from '../engine/scoring';
export { solveSubgamePerfect } from '../engine/solvers/subgame-perfect';
export { toFloat } from '../engine/numbers';
export { logitQre } from '../engine/solvers/qre';
export { fitLogit, trembleLogLikelihood, type Observation as EngineObservation } from '../engine/solvers/logit-fit';
