/** Role and state names shared by the database schema, the server and the browser. */
export const PLATFORM_ROLES = ['admin', 'facilitator', 'member'] as const;
export type PlatformRole = (typeof PLATFORM_ROLES)[number];

export const EXERCISE_STATES = ['draft', 'briefing', 'live', 'paused', 'ended'] as const;
export type ExerciseState = (typeof EXERCISE_STATES)[number];

export const EXERCISE_ROLES = ['facilitator', 'player', 'observer', 'sponsor'] as const;
export type ExerciseRole = (typeof EXERCISE_ROLES)[number];
