/**
 * `npm run bench:live`: 300 simulated participants in 30 concurrent exercises on
 * loopback, against the real built server. Each exercise has a facilitator and three
 * teams of three (a lead and two members); members draft, leads submit, the
 * facilitator reveals, draws and rewinds with undo, for three games per exercise
 * (people pause between actions: see THINK_MS).
 * A few connections are cut during play to exercise resume and resend.
 * First all 30 facilitators start their exercises in the same instant: that burst is
 * reported on its own (its slowest ack), then play runs with people's pauses and gives
 * the p50 and p99.
 *
 * Prints p50 and p99 acknowledgement latency (targets: p99 < 50 ms), messages per
 * second, and lost and duplicated moves (target zero), checked in the database after
 * the server has stopped.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import WebSocket from 'ws';
import { buildIfNeeded } from '../server/build';
import { LiveClient, type LiveState } from '../src/lib/exercise/live-client';
import type { Intent } from '../src/lib/exercise/protocol';
import type { Snapshot } from '../src/lib/exercise/view';
import { mulberry32 } from '../src/lib/engine';
import { signIn, startApp, type App, type Client } from '../tests/support/app';

const EXERCISES = 30;
const TEAMS = ['velmora', 'ostrakh', 'lantern'] as const;
const PER_TEAM = 3;
const GAMES = 3;
const DRAFTS_PER_MEMBER = 2;
const DROPS = 6;
/**
 * People pause between actions. The Desk sends a draft at most every 600 ms while someone
 * types; here each member edits every 200-600 ms and a lead submits 200-600 ms after the
 * last draft, a busy room rather than a realistic one (real turns take minutes).
 */
const THINK_MS: [number, number] = [200, 600];
const PASSWORD = 'bench-password-2026';

type Seat = { client: LiveClient; teamId: string | null; lead: boolean };
type Run = { id: string; facilitator: LiveClient; teams: Record<string, Seat[]> };

const latencies: number[] = [];
/** The acks of the 30 starts sent in the same instant, kept apart from the latencies of play. */
const burst: number[] = [];
let acrossReconnect = 0;
let refused = 0;
let messagesIn = 0;
let messagesOut = 0;
const sockets: WebSocket[] = [];
const submitted: { exerciseId: string; moveId: string }[] = [];
const rng = mulberry32(20260412);

function emailOf(exercise: number, slot: string): string {
  return `bench-${exercise}-${slot}@rungwise.example`;
}

// ---------------------------------------------------------------------------
// Set-up: accounts and exercises written straight into the server's database between two starts.

async function prepare(app: App): Promise<string[]> {
  await app.terminate();
  process.env.DATABASE_URL = app.databasePath;
  const { db, schema, closeDatabase } = await import('../src/db/client');
  const { auth } = await import('../src/lib/auth');
  const { createExercise, seatPerson } = await import('../src/lib/exercise/service');
  const { eq } = await import('drizzle-orm');
  const ctx = await auth().$context;
  const hash = await ctx.password.hash(PASSWORD);
  const owner = db().select().from(schema.user).where(eq(schema.user.email, 'facilitator@rungwise.example')).get()!;
  const version = db().select().from(schema.exercise).all()[0]!.scenarioVersionId;
  const ids: string[] = [];
  const now = Date.now();
  for (let e = 0; e < EXERCISES; e++) {
    const slots = ['facilitator', ...TEAMS.flatMap((t) => Array.from({ length: PER_TEAM }, (_, k) => `${t}-${k}`))];
    db().transaction((tx) => {
      for (const slot of slots) {
        const userId = crypto.randomUUID();
        const at = new Date(now);
        tx.insert(schema.user).values({ id: userId, name: `Bench ${e} ${slot}`, email: emailOf(e, slot), emailVerified: true, role: slot === 'facilitator' ? 'facilitator' : 'member', createdAt: at, updatedAt: at }).run();
        tx.insert(schema.account).values({ id: crypto.randomUUID(), accountId: userId, providerId: 'credential', userId, password: hash, createdAt: at, updatedAt: at }).run();
      }
    });
    const creator = { id: owner.id, name: owner.name, email: owner.email, role: owner.role };
    const { id } = createExercise(creator, { scenarioVersionId: version, title: `Bench run ${e}`, settings: { turnSeconds: null } }, now);
    await seatPerson(id, creator, { email: emailOf(e, 'facilitator'), role: 'facilitator', teamId: null, isLead: false }, now, { notify: false });
    for (const team of TEAMS) {
      for (let k = 0; k < PER_TEAM; k++) {
        await seatPerson(id, creator, { email: emailOf(e, `${team}-${k}`), role: 'player', teamId: team, isLead: k === 0 }, now, { notify: false });
      }
    }
    ids.push(id);
  }
  closeDatabase();
  await app.restart();
  return ids;
}

function connect(app: App, client: Client, exerciseId: string): LiveClient {
  const live = new LiveClient(exerciseId, null, (id) => {
    const socket = new WebSocket(`ws://127.0.0.1:${app.port}/ws/exercise/${id}`, { headers: { cookie: client.cookie, origin: app.url } });
    socket.on('error', () => undefined);
    socket.on('message', () => messagesIn++);
    const send = socket.send.bind(socket);
    socket.send = ((data: string) => {
      messagesOut++;
      send(data);
    }) as typeof socket.send;
    sockets.push(socket);
    return socket as unknown as globalThis.WebSocket;
  });
  live.start();
  return live;
}

async function inBatches<T, R>(items: T[], size: number, run: (item: T) => Promise<R>): Promise<R[]> {
  const out: R[] = [];
  for (let i = 0; i < items.length; i += size) out.push(...(await Promise.all(items.slice(i, i + size).map(run))));
  return out;
}

async function seatUp(app: App, ids: string[]): Promise<Run[]> {
  return inBatches(ids, 3, async (id) => {
    const e = ids.indexOf(id);
    const facilitator = connect(app, await signIn(app, emailOf(e, 'facilitator'), PASSWORD), id);
    const teams: Record<string, Seat[]> = {};
    for (const team of TEAMS) {
      teams[team] = [];
      for (let k = 0; k < PER_TEAM; k++) teams[team]!.push({ client: connect(app, await signIn(app, emailOf(e, `${team}-${k}`), PASSWORD), id), teamId: team, lead: k === 0 });
    }
    return { id, facilitator, teams };
  });
}

// ---------------------------------------------------------------------------
// Play.

function until(live: LiveClient, test: (s: LiveState) => boolean, ms = 30_000): Promise<void> {
  return new Promise((done, fail) => {
    if (test(live.state)) return done();
    const timer = setTimeout(() => fail(new Error('a client waited too long')), ms);
    const off = live.subscribe((s) => {
      if (!test(s)) return;
      clearTimeout(timer);
      off();
      done();
    });
  });
}

async function timed(client: LiveClient, intent: Intent, into = latencies): Promise<Record<string, unknown> | null> {
  const reconnects = client.state.reconnects;
  const start = performance.now();
  try {
    const result = await client.send(intent);
    if (client.state.reconnects === reconnects) into.push(performance.now() - start);
    else acrossReconnect++;
    return result;
  } catch {
    refused++;
    return null;
  }
}

const view = (c: LiveClient): Snapshot => c.state.snapshot!;
const pick = <T>(items: T[]): T => items[Math.floor(rng() * items.length)]!;
const think = () => new Promise((r) => setTimeout(r, THINK_MS[0] + rng() * (THINK_MS[1] - THINK_MS[0])));

async function moveTeam(run: Run, teamId: string, turn: number): Promise<void> {
  const seats = run.teams[teamId]!;
  await Promise.all(seats.map((s) => until(s.client, (st) => st.snapshot?.situation.turn === turn && st.connection === 'open')));
  const options = view(seats[0]!.client).situation.options[teamId]!.map((o) => o.label);
  await Promise.all(
    seats.map(async (seat) => {
      for (let d = 0; d < DRAFTS_PER_MEMBER; d++) {
        await think();
        await timed(seat.client, { kind: 'draft', turn, label: pick(options), proposal: null, rationale: `draft ${d} by a member`, confidence: Math.floor(rng() * 100) });
      }
    }),
  );
  const lead = seats.find((s) => s.lead)!;
  await think();
  const result = await timed(lead.client, { kind: 'submit', turn, choice: { action: pick(options) }, rationale: 'bench move', confidence: 50 });
  if (result?.moveId) submitted.push({ exerciseId: run.id, moveId: String(result.moveId) });
}

async function playToEnd(run: Run): Promise<void> {
  const F = run.facilitator;
  for (;;) {
    const s = view(F);
    if (s.exercise.state === 'ended') return;
    const turn = s.situation.turn;
    if (s.situation.kind === 'chance') await timed(F, { kind: 'chance', turn });
    else {
      await Promise.all(s.situation.movers.map((m) => moveTeam(run, m.teamId, turn)));
      if (s.situation.kind === 'simultaneous') {
        await until(F, (st) => st.snapshot!.situation.sealed.filter((m) => m.status === 'sealed').length === st.snapshot!.situation.movers.length);
        await timed(F, { kind: 'reveal', turn });
      }
    }
    await until(F, (st) => st.snapshot!.situation.turn !== turn || st.snapshot!.exercise.state === 'ended');
  }
}

async function rewind(run: Run): Promise<void> {
  const F = run.facilitator;
  while (view(F).situation.turn > 1) {
    const turn = view(F).situation.turn;
    await timed(F, { kind: 'undo', turn, reason: 'the benchmark plays the game again' });
    await until(F, (st) => st.snapshot!.situation.turn < turn);
  }
  if (view(F).exercise.state === 'paused') await timed(F, { kind: 'phase', to: 'live' });
  await until(F, (st) => st.snapshot!.exercise.state === 'live');
}

/** Every facilitator starts play at once; the rest of the run waits for all of them. */
async function startAllAtOnce(runs: Run[]): Promise<void> {
  await Promise.all(runs.map((run) => timed(run.facilitator, { kind: 'phase', to: 'live' }, burst)));
  await Promise.all(runs.map((run) => until(run.facilitator, (st) => st.snapshot!.exercise.state === 'live')));
  await new Promise((r) => setTimeout(r, 1_000));
}

async function playExercise(run: Run): Promise<void> {
  for (let game = 0; game < GAMES; game++) {
    await playToEnd(run);
    if (game < GAMES - 1) await rewind(run);
  }
}

/** Cut a few connections while play runs; the clients must resume and resend by themselves. */
async function dropSome(stop: () => boolean): Promise<number> {
  let dropped = 0;
  while (dropped < DROPS && !stop()) {
    await new Promise((r) => setTimeout(r, 700));
    const open = sockets.filter((s) => s.readyState === WebSocket.OPEN);
    pick(open)?.terminate();
    dropped++;
  }
  return dropped;
}

// ---------------------------------------------------------------------------
// Checks after the run, in the database itself.

async function audit(app: App): Promise<{ lost: number; duplicated: number; committedSubmits: number }> {
  await app.terminate();
  process.env.DATABASE_URL = app.databasePath;
  const { db, schema, closeDatabase } = await import('../src/db/client');
  const { inArray, sql } = await import('drizzle-orm');
  const ids = [...new Set(submitted.map((s) => s.exerciseId))];
  const moves = db().select({ id: schema.exerciseMove.id }).from(schema.exerciseMove).where(inArray(schema.exerciseMove.exerciseId, ids)).all();
  const known = new Set(moves.map((m) => m.id));
  const lost = submitted.filter((s) => !known.has(s.moveId)).length;
  const committedSubmits = db()
    .select({ n: sql<number>`count(*)` })
    .from(schema.exerciseEvent)
    .where(sql`${schema.exerciseEvent.kind} = 'submit' and ${schema.exerciseEvent.intentKey} is not null and ${inArray(schema.exerciseEvent.exerciseId, ids)}`)
    .get()!.n;
  const doubled = db().all<{ n: number }>(sql`select count(*) as n from (
      select exercise_id, turn, team_id from exercise_move
      where status <> 'undone' and team_id is not null
      group by exercise_id, turn, team_id having count(*) > 1)`)[0]!.n;
  closeDatabase();
  return { lost, duplicated: Math.max(0, Number(committedSubmits) - submitted.length) + Number(doubled), committedSubmits: Number(committedSubmits) };
}

function percentile(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

async function main(): Promise<void> {
  buildIfNeeded();
  console.log(`Starting the server and seating ${EXERCISES * (1 + TEAMS.length * PER_TEAM)} participants in ${EXERCISES} exercises…`);
  const app = await startApp({ env: { RUNGWISE_SIGNIN_LIMIT: '100000' } });
  try {
    const ids = await prepare(app);
    const runs = await seatUp(app, ids);
    const clients = runs.flatMap((r) => [r.facilitator, ...Object.values(r.teams).flat().map((s) => s.client)]);
    await Promise.all(clients.map((c) => until(c, (s) => s.connection === 'open' && s.snapshot !== null)));
    console.log(`${clients.length} participants connected; starting all ${runs.length} exercises at once…`);
    await startAllAtOnce(runs);
    console.log(`Playing ${GAMES} games in each exercise…`);
    messagesIn = 0;
    messagesOut = 0;
    const start = performance.now();
    let finished = false;
    const drops = dropSome(() => finished);
    await Promise.all(runs.map(playExercise));
    finished = true;
    const seconds = (performance.now() - start) / 1000;
    const dropped = await drops;
    for (const c of clients) c.stop();
    const { lost, duplicated, committedSubmits } = await audit(app);
    const result = {
      participants: clients.length,
      exercises: runs.length,
      acknowledged: latencies.length + acrossReconnect,
      p50Ms: Number(percentile(latencies, 50).toFixed(2)),
      p99Ms: Number(percentile(latencies, 99).toFixed(2)),
      maxMs: Number(Math.max(...latencies).toFixed(2)),
      simultaneousStarts: burst.length,
      simultaneousStartSlowestMs: Number(Math.max(...burst).toFixed(2)),
      messagesPerSecond: Math.round((messagesIn + messagesOut) / seconds),
      seconds: Number(seconds.toFixed(1)),
      connectionsCut: dropped,
      acknowledgedAcrossAReconnect: acrossReconnect,
      refused,
      movesSubmitted: submitted.length,
      submitsCommitted: committedSubmits,
      lost,
      duplicated,
    };
    const rows: [string, string, string][] = [
      ['participants / exercises', `${result.participants} / ${result.exercises}`, '300 / 30'],
      [`${result.exercises} starts sent at once: slowest ack`, `${result.simultaneousStartSlowestMs} ms`, ''],
      ['intents acknowledged in play', String(result.acknowledged), ''],
      ['ack latency p50', `${result.p50Ms} ms`, ''],
      ['ack latency p99', `${result.p99Ms} ms`, '< 50 ms'],
      ['ack latency max', `${result.maxMs} ms`, ''],
      ['messages per second (in + out)', String(result.messagesPerSecond), ''],
      ['wall time of play', `${result.seconds} s`, ''],
      ['connections cut during play', String(result.connectionsCut), ''],
      ['acks that spanned a reconnect (not in the latencies)', String(result.acknowledgedAcrossAReconnect), ''],
      ['intents refused', String(result.refused), '0'],
      ['moves acknowledged / committed', `${result.movesSubmitted} / ${result.submitsCommitted}`, 'equal'],
      ['lost moves', String(result.lost), '0'],
      ['duplicated moves', String(result.duplicated), '0'],
    ];
    console.log('');
    for (const [name, measured, target] of rows) console.log(`${name.padEnd(54)} ${measured.padStart(14)}   ${target}`);
    mkdirSync('bench-results', { recursive: true });
    writeFileSync('bench-results/live.json', `${JSON.stringify(result, null, 2)}\n`);
    const ok = result.p99Ms < 50 && result.lost === 0 && result.duplicated === 0 && result.refused === 0;
    console.log(ok ? '\nAll targets met.' : '\nSome targets were missed.');
  } finally {
    await app.stop();
  }
}

await main();
