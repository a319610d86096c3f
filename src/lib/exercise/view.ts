/**
 * What a client is shown: the snapshot, filtered on the server for the seat
 * it is sent to, in named sections. A numbered update carries only the
 * sections a change touched. Browser-safe types only.
 */
import type { ExerciseRole, ExerciseState } from '../roles';
import type { PlayedMove, ObserverNote } from './record';
import type { RichText } from '../scenario';
import type { DeadlineRule, Settings } from './settings';

export type TeamView = { id: string; name: string; colour: string | null; lead: string | null; members: string[] };

export type SeatView = {
  userId: string;
  name: string;
  role: ExerciseRole;
  teamId: string | null;
  isLead: boolean;
  may: { draft: boolean; submit: boolean; run: boolean; note: boolean; analysis: boolean };
  /** Why this seat may not submit now, when it may not. */
  submitRefusal: string | null;
};

export type ExerciseView = {
  id: string;
  title: string;
  state: ExerciseState;
  scenarioTitle: string;
  setting: string;
  teams: TeamView[];
  /** Facilitators see every setting; others the ones that shape their screen. */
  settings: Partial<Settings> & Pick<Settings, 'submitter' | 'turnSeconds' | 'atDeadline'>;
  startedAt: number | null;
  endedAt: number | null;
};

export type OptionView = {
  label: string;
  description: string | null;
  rungName: string | null;
  intensity: number | null;
  move: string | null;
};

export type StageKind = 'decision' | 'simultaneous' | 'chance' | 'terminal';
export type MoverStatus = 'waiting' | 'drafting' | 'proposed' | 'submitted';

export type SealedView = {
  moveId: string;
  teamId: string;
  kind: 'ladder' | 'adjudicated';
  status: 'proposed' | 'sealed';
  label: string | null;
  proposal: string | null;
  rationale: string | null;
  confidence: number | null;
  reason: string | null;
  submittedByName: string | null;
  at: number;
};

export type SituationView = {
  turn: number;
  nodeId: string;
  kind: StageKind;
  /** Where the crisis stands: the rung reached by the last move, if the ladder names one. */
  rung: { name: string; description: string; intensity: number } | null;
  movers: { teamId: string; status: MoverStatus; at: number | null }[];
  /** The options of each moving team this seat may see. */
  options: Record<string, OptionView[]>;
  chance: { label: string; p: string }[] | null;
  outcome: { text: string; payoffs: Record<string, string> | null } | null;
  /** Submissions not yet in effect: all of them for facilitators, the own team's for players. */
  sealed: SealedView[];
  /** Terminal outcomes reachable from here, for ending the game by adjudication (facilitators). */
  endings: { nodeId: string; text: string }[] | null;
};

export type ClockView = {
  status: 'none' | 'held' | 'running' | 'expired';
  deadlineAt: number | null;
  leftMs: number | null;
  turnSeconds: number | null;
  rule: DeadlineRule;
};

export type MoveView = PlayedMove;

export type DraftView = {
  teamId: string;
  turn: number;
  label: string | null;
  proposal: string | null;
  rationale: string;
  confidence: number | null;
  updatedByName: string;
  updatedAt: number;
};

export type AttachmentView = { id: string; filename: string; contentType: string; size: number };

export type InjectView = {
  id: string;
  turn: number;
  title: string;
  body: string;
  to: string[] | 'all';
  attachments: AttachmentView[];
  at: number;
  marking: 'EXERCISE';
};

export type AuthoredInjectView = {
  id: string;
  nodeId: string | null;
  title: string;
  body: string;
  to: string[] | 'all';
  attachmentIds: string[];
  released: boolean;
  /** Authored for the node play stands at. */
  due: boolean;
};

/** A brief: the one for every team (teamId null, with the setting) or one team's private brief. */
export type BriefView = { teamId: string | null; teamName: string; setting: string | null; brief: RichText | null; attachments: AttachmentView[] };

export type LogEntry = { seq: number; kind: string; actorName: string; summary: string; at: number };

export type RosterEntry = {
  membershipId: string;
  userId: string;
  name: string;
  email: string;
  role: ExerciseRole;
  teamId: string | null;
  isLead: boolean;
};

export type PendingInvitation = { id: string; email: string; role: ExerciseRole | null; teamId: string | null; expiresAt: number };

export type EquilibriumAdvice = {
  /** The action subgame-perfect play takes at this stage, per moving team. */
  actions: { teamId: string; label: string; margin: string | null }[];
  /** The outcome rational play from here reaches, and its payoffs. */
  outcome: string | null;
  payoffs: Record<string, string> | null;
  note: string | null;
};

export type ForecastView = { lambda: number; teams: { teamId: string; probabilities: Record<string, number> }[] };

export type AnalysisView =
  | { status: 'ready'; nodeId: string; equilibrium: EquilibriumAdvice | null; forecast: ForecastView | null; caution: string }
  | { status: 'computing' | 'unavailable'; nodeId: string; message: string; caution: string };

export type Snapshot = {
  exercise: ExerciseView;
  me: SeatView;
  situation: SituationView;
  clock: ClockView;
  moves: MoveView[];
  drafts: DraftView[];
  injects: InjectView[];
  briefs: BriefView[];
  /** null when this seat may not read them. */
  notes: ObserverNote[] | null;
  authored: AuthoredInjectView[] | null;
  log: LogEntry[] | null;
  roster: { members: RosterEntry[]; invitations: PendingInvitation[] } | null;
  analysis: AnalysisView | null;
};

export type SectionName = keyof Snapshot;
export const SECTIONS: SectionName[] = [
  'exercise',
  'me',
  'situation',
  'clock',
  'moves',
  'drafts',
  'injects',
  'briefs',
  'notes',
  'authored',
  'log',
  'roster',
  'analysis',
];

export type EventSummary = { seq: number; kind: string; actorName: string; summary: string; at: number };

export type PresenceView = { online: { userId: string; name: string; teamId: string | null; role: ExerciseRole }[] };

export const ANALYSIS_CAUTION =
  'Follows from the payoffs the scenario assumes. An aid to discussion, not a prediction of what any government will do.';
