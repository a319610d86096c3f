/**
 * Report figures as resolution-free drawings: a list of lines, paths, rectangles,
 * dots and text in a box of points. The PDF and HTML exports paint the same
 * drawing, so both show the same chart as vector graphics.
 */
import type { EscalationSpec, FigureSpec, RegretSpec } from '../figures';

export type Shape =
  | { kind: 'line'; x1: number; y1: number; x2: number; y2: number; stroke: string; width: number; dash?: number[] }
  | { kind: 'path'; points: [number, number][]; stroke: string; width: number; dash?: number[] }
  | { kind: 'rect'; x: number; y: number; w: number; h: number; fill: string }
  | { kind: 'dot'; cx: number; cy: number; r: number; fill: string; stroke?: string }
  /** y is the text's baseline. */
  | { kind: 'text'; x: number; y: number; text: string; size: number; anchor: 'start' | 'middle' | 'end'; fill: string; bold?: boolean };

export type Drawing = { width: number; height: number; title: string; shapes: Shape[] };

/** Series colours from our palette: team order, never a team's name. */
export const TEAM_COLOURS = ['#2f4f73', '#a5362b', '#3a7150', '#b06f1e', '#647384', '#5e3a0f'];
export const ACTUAL_COLOUR = '#935b17';
export const EQUILIBRIUM_COLOUR = '#34414f';
const GRID = '#d6dce2';
const AXIS = '#4a5868';
const LABEL = '#34414f';

const MARGIN = { left: 118, right: 14, top: 30, bottom: 34 };

const clip = (text: string, max: number) => (text.length > max ? `${text.slice(0, max - 1)}…` : text);

type Frame = { left: number; right: number; top: number; bottom: number; slot: number; x: (turn: number) => number };

/** Points run edge to edge; bands put each turn in the middle of its own slot. */
function frame(width: number, height: number, turns: number, bands = false): Frame {
  const left = MARGIN.left;
  const right = width - MARGIN.right;
  const slot = (right - left) / Math.max(turns, 1);
  const x = bands
    ? (turn: number) => left + (turn - 0.5) * slot
    : (turn: number) => (turns <= 1 ? (left + right) / 2 : left + ((turn - 1) / (turns - 1)) * (right - left));
  return { left, right, top: MARGIN.top, bottom: height - MARGIN.bottom, slot, x };
}

/** Turn numbers along the x axis: every turn when few, else about ten. */
function turnAxis(f: Frame, turns: number): Shape[] {
  const every = Math.max(1, Math.ceil(turns / 10));
  const shapes: Shape[] = [{ kind: 'line', x1: f.left, y1: f.bottom, x2: f.right, y2: f.bottom, stroke: AXIS, width: 0.8 }];
  for (let turn = 1; turn <= turns; turn++) {
    if ((turn - 1) % every !== 0 && turn !== turns) continue;
    shapes.push({ kind: 'text', x: f.x(turn), y: f.bottom + 13, text: String(turn), size: 8, anchor: 'middle', fill: LABEL });
  }
  shapes.push({ kind: 'text', x: (f.left + f.right) / 2, y: f.bottom + 27, text: 'Turn', size: 8, anchor: 'middle', fill: AXIS });
  return shapes;
}

/** A legend line along the top, ending at the plot's right edge. */
function legend(entries: { label: string; colour: string; dash?: number[]; bar?: boolean }[], right: number): Shape[] {
  const shapes: Shape[] = [];
  const widthOf = (label: string) => 34 + label.length * 4.6;
  let x = right - entries.reduce((sum, e) => sum + widthOf(e.label), 0) + 12;
  for (const entry of entries) {
    if (entry.bar) shapes.push({ kind: 'rect', x, y: 8, w: 14, h: 9, fill: entry.colour });
    else shapes.push({ kind: 'line', x1: x, y1: 12.5, x2: x + 18, y2: 12.5, stroke: entry.colour, width: 2.2, dash: entry.dash });
    shapes.push({ kind: 'text', x: x + 22, y: 16, text: entry.label, size: 8.5, anchor: 'start', fill: LABEL });
    x += widthOf(entry.label);
  }
  return shapes;
}

function runs(points: [number, number | null][]): [number, number][][] {
  const out: [number, number][][] = [];
  let current: [number, number][] = [];
  for (const [x, y] of points) {
    if (y === null) {
      if (current.length) out.push(current);
      current = [];
    } else current.push([x, y]);
  }
  if (current.length) out.push(current);
  return out;
}

function escalation(spec: EscalationSpec, width: number, height: number): Drawing {
  const f = frame(width, height, spec.points.length);
  const levels = [...spec.rungs.map((r) => r.intensity), ...spec.points.flatMap((p) => [p.actual, p.equilibrium]).filter((v): v is number => v !== null)];
  const low = levels.length ? Math.min(...levels) : 0;
  const high = levels.length ? Math.max(...levels) : 1;
  const y = (v: number) => f.bottom - ((v - low) / (high - low || 1)) * (f.bottom - f.top - 8) - 4;
  const shapes: Shape[] = [];
  const ticks = spec.rungs.length ? spec.rungs : [...new Set(levels)].map((v) => ({ name: String(v), intensity: v }));
  for (const rung of ticks) {
    shapes.push({ kind: 'line', x1: f.left, y1: y(rung.intensity), x2: f.right, y2: y(rung.intensity), stroke: GRID, width: 0.6 });
    shapes.push({ kind: 'text', x: f.left - 6, y: y(rung.intensity) + 3, text: clip(rung.name, 24), size: 7.5, anchor: 'end', fill: LABEL });
  }
  shapes.push(...turnAxis(f, spec.points.length));
  const series = [
    { values: spec.points.map((p) => [f.x(p.turn), p.equilibrium === null ? null : y(p.equilibrium)] as [number, number | null]), colour: EQUILIBRIUM_COLOUR, dash: [5, 4], r: 2.4 },
    { values: spec.points.map((p) => [f.x(p.turn), p.actual === null ? null : y(p.actual)] as [number, number | null]), colour: ACTUAL_COLOUR, dash: undefined, r: 3.2 },
  ];
  for (const s of series) {
    for (const run of runs(s.values)) {
      if (run.length > 1) shapes.push({ kind: 'path', points: run, stroke: s.colour, width: 2, dash: s.dash });
      for (const [cx, cy] of run) shapes.push({ kind: 'dot', cx, cy, r: s.r, fill: s.dash ? '#ffffff' : s.colour, stroke: s.colour });
    }
  }
  shapes.push(...legend([{ label: 'Actual play', colour: ACTUAL_COLOUR }, { label: 'Subgame-perfect path', colour: EQUILIBRIUM_COLOUR, dash: [5, 4] }], f.right));
  return { width, height, title: spec.title, shapes };
}

/** About four round tick values covering low..high (steps of 1, 2, 2.5 or 5 times a power of ten). */
export function niceTicks(low: number, high: number): number[] {
  const span = high - low || 1;
  const raw = span / 4;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((s) => s >= raw)!;
  const ticks: number[] = [];
  for (let v = Math.ceil(low / step) * step; v <= high + step * 1e-9; v += step) ticks.push(Number(v.toFixed(10)));
  return ticks;
}

function regret(spec: RegretSpec, width: number, height: number): Drawing {
  const turns = spec.points.length ? Math.max(...spec.points.map((p) => p.turn)) : 1;
  const f = frame(width, height, turns, true);
  const values = spec.points.map((p) => p.regret);
  const low = Math.min(0, ...values);
  const high = Math.max(0, ...values, 1e-9);
  const ticks = niceTicks(low, high);
  const top = Math.max(high, ticks.at(-1)!);
  const bottom = Math.min(low, ticks[0]!);
  const y = (v: number) => f.bottom - ((v - bottom) / (top - bottom || 1)) * (f.bottom - f.top);
  const shapes: Shape[] = [];
  for (const t of ticks) {
    shapes.push({ kind: 'line', x1: f.left, y1: y(t), x2: f.right, y2: y(t), stroke: GRID, width: 0.6 });
    shapes.push({ kind: 'text', x: f.left - 6, y: y(t) + 3, text: String(t), size: 7.5, anchor: 'end', fill: LABEL });
  }
  shapes.push({ kind: 'text', x: f.left - 6, y: f.top - 8, text: 'Regret', size: 8, anchor: 'end', fill: AXIS });
  shapes.push(...turnAxis(f, turns));
  const teamOf = (id: string) => Math.max(0, spec.teams.findIndex((t) => t.id === id));
  for (let turn = 1; turn <= turns; turn++) {
    // Moves of one turn (a simultaneous stage) stand side by side in the turn's slot.
    const here = spec.points.filter((p) => p.turn === turn).sort((a, b) => teamOf(a.teamId) - teamOf(b.teamId));
    const barWidth = Math.max(3, Math.min(26, (f.slot * 0.7) / Math.max(here.length, 1)));
    here.forEach((p, j) => {
      const y0 = y(0);
      const y1 = y(p.regret);
      const x = f.x(turn) + (j - (here.length - 1) / 2) * (barWidth + 1) - barWidth / 2;
      shapes.push({ kind: 'rect', x, y: Math.min(y0, y1), w: barWidth, h: Math.max(0.8, Math.abs(y1 - y0)), fill: TEAM_COLOURS[teamOf(p.teamId) % TEAM_COLOURS.length]! });
    });
  }
  shapes.push({ kind: 'line', x1: f.left, y1: y(0), x2: f.right, y2: y(0), stroke: AXIS, width: 0.8 });
  shapes.push(...legend(spec.teams.map((t, i) => ({ label: t.name, colour: TEAM_COLOURS[i % TEAM_COLOURS.length]!, bar: true })), f.right));
  return { width, height, title: spec.title, shapes };
}

export function drawFigure(spec: FigureSpec, width = 480, height = 210): Drawing {
  return spec.kind === 'escalation' ? escalation(spec, width, height) : regret(spec, width, height);
}
