/**
 * Two demo exercises on the Serrin Strait scenario, made through the exercise
 * service like any real one: (1) a finished run, played move by move to an
 * outcome, with a deviation from the equilibrium, an off-ladder proposal the
 * facilitator adjudicated, a seeded chance draw, a simultaneous stage, injects
 * and tagged observer notes; (2) a run in its briefing, everyone seated, ready
 * for the facilitator to start play. All people and events are invented.
 */
import { eq } from 'drizzle-orm';
import { db, schema } from '../../src/db/client';
import type { SessionUser } from '../../src/lib/auth';
import type { Intent } from '../../src/lib/exercise/protocol';
import { applyIntent, createExercise, seatPerson, type SeatInput } from '../../src/lib/exercise/service';
import { DEMO_PEOPLE, type DemoIds, type DemoPerson } from './people';
import type { SeededScenario } from './scenario';

export type SeededExercises = { finishedExerciseId: string; liveExerciseId: string };

/** The finished run's chance seed: its first draw (0.1287) falls on the collision (p = 1/4), as the story below expects. */
const FINISHED_RUN_SEED = '424242';
const MINUTE = 60_000;

type Seating = [DemoPerson, Omit<SeatInput, 'email'>];

const SEATS: Seating[] = [
  ['blue', { role: 'player', teamId: 'velmora', isLead: true }],
  ['blue2', { role: 'player', teamId: 'velmora', isLead: false }],
  ['red', { role: 'player', teamId: 'ostrakh', isLead: true }],
  ['mediator', { role: 'player', teamId: 'lantern', isLead: true }],
  ['observer', { role: 'observer', teamId: null, isLead: false }],
  ['sponsor', { role: 'sponsor', teamId: null, isLead: false }],
];

function sessionUser(id: string): SessionUser {
  const row = db().select().from(schema.user).where(eq(schema.user.id, id)).get()!;
  return { id: row.id, name: row.name, email: row.email, role: row.role };
}

async function seatEveryone(exerciseId: string, facilitator: SessionUser, at: number): Promise<void> {
  for (const [person, seat] of SEATS) {
    await seatPerson(exerciseId, facilitator, { email: DEMO_PEOPLE[person].email, ...seat }, at, { notify: false });
  }
}

/** One scripted step: who acts, what, and how many minutes into the session. */
type Step = [DemoPerson, number, Intent];

let keys = 0;
const key = () => `seed-${++keys}-${crypto.randomUUID().slice(0, 8)}`;

function play(exerciseId: string, people: DemoIds, start: number, steps: Step[]): void {
  for (const [person, minute, intent] of steps) {
    const user = sessionUser(people[person]);
    applyIntent(exerciseId, user, key(), intent, start + minute * MINUTE);
  }
}

const submit = (turn: number, action: string, rationale: string, confidence: number): Intent => ({ kind: 'submit', turn, choice: { action }, rationale, confidence });
const note = (turn: number | null, tags: string[], text: string): Intent => ({ kind: 'note', turn, moveId: null, tags, text });

function finishedRunSteps(): Step[] {
  return [
    ['facilitator', 0, { kind: 'phase', to: 'briefing' }],
    ['facilitator', 20, { kind: 'phase', to: 'live' }],
    ['blue2', 24, { kind: 'draft', turn: 1, label: 'Hold at Naval shadowing', proposal: null, rationale: 'Keep the frigates where they are and let Ostrakh move first.', confidence: 55 }],
    ['blue', 29, { kind: 'draft', turn: 1, label: 'Climb to Exclusion zone', proposal: null, rationale: 'Declare the zone before the survey ships finish; show we will not be walked back.', confidence: 65 }],
    ['blue', 31, submit(1, 'Climb to Exclusion zone', 'Declare the zone before the survey ships finish; show we will not be walked back.', 65)],
    ['observer', 32, note(1, ['signalling', 'escalation risk'], 'Velmora climbs at once. The lead overrode the analyst’s draft to hold; the team wanted to look resolute to the home audience.')],
    ['facilitator', 33, { kind: 'inject', title: 'Minelayers leave Port Dravik', body: 'Velmoran naval intelligence reports that two Ostrakhi minelayers left Port Dravik at dawn, escorted by a corvette. Their course would bring them to the eastern channel within a day. The report has not been shared with allies.', to: ['velmora'], attachmentIds: [], authoredId: 'minelayers' }],
    ['red', 41, { kind: 'submit', turn: 2, choice: { proposal: 'Announce a joint hydrographic survey with the Lantern Isles Council while our frigates stay on station outside the zone.' }, rationale: 'Neither back down nor climb; give the Council a role so we are not the ones who blink.', confidence: 50 }],
    ['facilitator', 44, { kind: 'adjudicate', turn: 2, teamId: 'ostrakh', decision: { action: 'Hold at Exclusion zone' }, reason: 'The survey offer changes nothing at sea: the frigates keep their position outside the zone, so the crisis holds where it stands.' }],
    ['observer', 45, note(2, ['restraint', 'coalition strain'], 'Ostrakh looked for a way to hold without seeming to yield and reached for the Council. Adjudicated as a hold.')],
    ['mediator', 52, submit(3, 'Stand aside', 'Too early to table a settlement; neither side has asked and we would spend our standing for nothing.', 60)],
    ['facilitator', 53, note(3, ['misreading'], 'The Council waits for an invitation that neither side will give (see the envoy inject they did not receive yet).')],
    ['facilitator', 55, { kind: 'inject', title: 'Insurers suspend war-risk cover', body: 'The Lantern Isles marine insurance market announces that war-risk cover for the eastern channel is suspended until further notice. Three container lines say they will divert around the Outer Banks, adding four days to each voyage.', to: 'all', attachmentIds: [], authoredId: 'insurers' }],
    ['facilitator', 58, { kind: 'chance', turn: 4 }],
    ['observer', 59, note(4, ['surprise'], 'Collision between patrol vessels in the night: the crisis jumps to cargo inspections without either capital choosing it.')],
    ['facilitator', 60, { kind: 'inject', title: 'Crew of the Ostrakhi patrol boat missing', body: 'Two sailors from the Ostrakhi patrol boat involved in the collision are missing. Ostrakhi state television shows the damaged bow; Velmoran channels show the same footage with a different account.', to: 'all', attachmentIds: [], authoredId: null }],
    ['blue2', 66, { kind: 'draft', turn: 5, label: 'Step down to Exclusion zone', proposal: null, rationale: 'Offer to lift the inspections if search and rescue can work together.', confidence: 60 }],
    ['blue', 71, submit(5, 'Step down to Exclusion zone', 'Offer to lift the inspections if search and rescue can work together.', 60)],
    ['red', 73, submit(5, 'Climb to Partial blockade', 'After the collision we cannot be seen to back off; close the channel to Velmoran shipping.', 70)],
    ['facilitator', 75, { kind: 'reveal', turn: 5 }],
    ['observer', 76, note(5, ['signalling', 'misreading'], 'Simultaneous round: Velmora stepped down while Ostrakh climbed. Each expected the other to read its move as a reply to the collision.')],
    ['mediator', 83, submit(6, 'Broker a settlement', 'Now both sides need a way out; table the draft settlement with the search and rescue arrangement first.', 75)],
    ['observer', 84, note(null, ['good practice'], 'The Council’s timing: it stood aside when nobody asked and brokered once both sides were paying for the crisis.')],
    ['facilitator', 86, note(6, ['escalation risk'], 'Hot wash point: the chance collision did more to move play than any team’s choice.')],
  ];
}

async function seedFinishedRun(people: DemoIds, scenario: SeededScenario): Promise<string> {
  const facilitator = sessionUser(people.facilitator);
  const yesterday = new Date();
  yesterday.setDate(yesterday.getDate() - 1);
  yesterday.setHours(9, 30, 0, 0);
  const start = yesterday.getTime();
  const { id } = createExercise(
    facilitator,
    { scenarioVersionId: scenario.versionId, title: 'Serrin Strait · staff course, run 1', settings: { turnSeconds: 900, atDeadline: 'facilitator' } },
    start - 2 * 24 * 60 * MINUTE,
    { chanceSeed: FINISHED_RUN_SEED },
  );
  await seatEveryone(id, facilitator, start - 2 * 24 * 60 * MINUTE + MINUTE);
  play(id, people, start, finishedRunSteps());
  const state = db().select({ state: schema.exercise.state }).from(schema.exercise).where(eq(schema.exercise.id, id)).get();
  if (state?.state !== 'ended') throw new Error(`The demo run did not reach an outcome (it is ${state?.state}); the Serrin Strait tree changed`);
  return id;
}

async function seedLiveRun(people: DemoIds, scenario: SeededScenario): Promise<string> {
  const facilitator = sessionUser(people.facilitator);
  const now = Date.now();
  const { id } = createExercise(facilitator, { scenarioVersionId: scenario.versionId, title: 'Serrin Strait · staff course, run 2', settings: { turnSeconds: 600, atDeadline: 'facilitator' } }, now);
  await seatEveryone(id, facilitator, now);
  applyIntent(id, facilitator, key(), { kind: 'phase', to: 'briefing' }, now);
  return id;
}

export async function seedExercises(people: DemoIds, scenario: SeededScenario): Promise<SeededExercises> {
  const finishedExerciseId = await seedFinishedRun(people, scenario);
  const liveExerciseId = await seedLiveRun(people, scenario);
  return { finishedExerciseId, liveExerciseId };
}
