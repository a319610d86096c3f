/**
 * What a facilitator sets for one exercise. Stored in exercise.settings; the
 * access rules read `submitter`, `analysisForPlayers` and `playersMayComment`.
 */
import { z } from 'zod';

/** The observer-log tags a new exercise starts with; the facilitator edits the set. */
export const DEFAULT_TAGS = ['signalling', 'misreading', 'escalation risk', 'restraint', 'coalition strain', 'surprise', 'good practice'];

export const DEADLINE_RULES = ['hold', 'facilitator'] as const;
export type DeadlineRule = (typeof DEADLINE_RULES)[number];

export const settingsShape = {
  /** Who on a team submits its move. */
  submitter: z.enum(['lead', 'any']),
  /** Show the equilibrium recommendation and the forecast to players too. */
  analysisForPlayers: z.boolean(),
  /** Players may comment on the report draft. */
  playersMayComment: z.boolean(),
  /** Seconds each turn runs; null for no clock. */
  turnSeconds: z.number().int('whole seconds').min(2, 'at least 2 seconds').max(7 * 24 * 3600, 'at most a week').nullable(),
  /** At the deadline: hold the late team's position, or leave the move to the facilitator. */
  atDeadline: z.enum(DEADLINE_RULES),
  /** The observer-log tags of this exercise. */
  tags: z
    .array(z.string().trim().min(1, 'a tag cannot be empty').max(40, 'at most 40 characters'))
    .max(40, 'at most 40 tags')
    .refine((tags) => new Set(tags).size === tags.length, 'tags must be distinct'),
  /** Rationality of the logit quantal response forecast shown beside the equilibrium. */
  forecastLambda: z.number().min(0).max(50),
};

export const settingsSchema = z.object(settingsShape).strict();
export type Settings = z.infer<typeof settingsSchema>;
export const settingsPatchSchema = settingsSchema.partial();
export type SettingsPatch = z.infer<typeof settingsPatchSchema>;

export const DEFAULT_SETTINGS: Settings = {
  submitter: 'lead',
  analysisForPlayers: false,
  playersMayComment: false,
  turnSeconds: 600,
  atDeadline: 'facilitator',
  tags: DEFAULT_TAGS,
  forecastLambda: 1,
};

/** Stored settings over the defaults; unknown or broken keys fall back to the default. */
export function readSettings(stored: unknown): Settings {
  const record = (stored && typeof stored === 'object' ? stored : {}) as Record<string, unknown>;
  const out: Record<string, unknown> = { ...DEFAULT_SETTINGS };
  for (const [key, schema] of Object.entries(settingsShape)) {
    const parsed = (schema as z.ZodType).safeParse(record[key]);
    if (parsed.success && record[key] !== undefined) out[key] = parsed.data;
  }
  return out as Settings;
}
