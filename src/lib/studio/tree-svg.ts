/**
 * The visible tree as a standalone SVG document (for export, and drawn onto a
 * canvas for PNG). Built from the same layout as the canvas, in our palette.
 */
import type { TreeView, ViewNode } from './tree-view';

export type SvgBox = { x: number; y: number; width: number; height: number };

export type SvgInput = {
  view: TreeView;
  boxes: Map<string, SvgBox>;
  teamNames: Map<string, string>;
  /** Formatted payoffs per terminal id, in team order. */
  payoffs: Map<string, string[]>;
  /** Ids of nodes on the highlighted (equilibrium) path. */
  path: ReadonlySet<string>;
  title: string;
};

const PAPER = '#f7f5f0';
const INK = '#18212b';
const MUTED = '#647384';
const FRAME = '#b3bdc7';
const PATH = '#935b17';
const MARGIN = 24;

const escape = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function clip(text: string, max: number): string {
  return text.length > max ? `${text.slice(0, max - 1)}…` : text;
}

function nodeBody(v: ViewNode, box: SvgBox, input: SvgInput): string {
  const onPath = input.path.has(v.id);
  const stroke = onPath ? PATH : FRAME;
  const width = onPath ? 2.5 : 1;
  const { x, y } = box;
  const lines: string[] = [];
  if (v.node.kind === 'decision') {
    lines.push(clip(input.teamNames.get(v.node.team) ?? v.node.team, 26));
    if (v.node.infoset) lines.push(`set ${clip(v.node.infoset, 20)}`);
  } else if (v.node.kind === 'chance') {
    lines.push('Chance');
  } else {
    const values = input.payoffs.get(v.id) ?? [];
    lines.push(clip(v.node.outcome ?? 'Outcome', 26));
    [...input.teamNames.values()].forEach((name, i) => lines.push(`${clip(name, 16)}: ${values[i] ?? '?'}`));
  }
  if (v.collapsed) lines.push(`+${v.hidden} hidden`);
  const rx = v.node.kind === 'chance' ? box.height / 2 : 6;
  const text = lines
    .map((line, i) => `<text x="${x + 10}" y="${y + 18 + i * 16}" font-size="${i === 0 ? 13 : 11}" fill="${i === 0 ? INK : MUTED}">${escape(line)}</text>`)
    .join('');
  return `<rect x="${x}" y="${y}" width="${box.width}" height="${box.height}" rx="${rx}" fill="#ffffff" stroke="${stroke}" stroke-width="${width}"/>${text}`;
}

function edge(v: ViewNode, input: SvgInput): string {
  const from = input.boxes.get(v.parentId!);
  const to = input.boxes.get(v.id);
  if (!from || !to) return '';
  const onPath = input.path.has(v.id) && input.path.has(v.parentId!);
  const x1 = from.x + from.width;
  const y1 = from.y + from.height / 2;
  const x2 = to.x;
  const y2 = to.y + to.height / 2;
  const mid = (x1 + x2) / 2;
  const stroke = onPath ? PATH : FRAME;
  const label = v.edgeLabel
    ? `<text x="${mid}" y="${(y1 + y2) / 2 - 4}" font-size="11" text-anchor="middle" fill="${onPath ? PATH : INK}">${escape(clip(v.edgeLabel, 24))}</text>`
    : '';
  return `<path d="M${x1},${y1} C${mid},${y1} ${mid},${y2} ${x2},${y2}" fill="none" stroke="${stroke}" stroke-width="${onPath ? 2.5 : 1.2}"/>${label}`;
}

export function treeSvg(input: SvgInput): string {
  let maxX = 0;
  let maxY = 0;
  for (const b of input.boxes.values()) {
    maxX = Math.max(maxX, b.x + b.width);
    maxY = Math.max(maxY, b.y + b.height);
  }
  const width = Math.ceil(maxX + 2 * MARGIN);
  const height = Math.ceil(maxY + 2 * MARGIN + 28);
  const edges = input.view.nodes.filter((v) => v.parentId !== null).map((v) => edge(v, input));
  const nodes = input.view.nodes.map((v) => {
    const box = input.boxes.get(v.id);
    return box ? nodeBody(v, box, input) : '';
  });
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="Libre Franklin, Helvetica, Arial, sans-serif">`,
    `<rect width="100%" height="100%" fill="${PAPER}"/>`,
    `<text x="${MARGIN}" y="${MARGIN}" font-size="14" font-weight="600" fill="${INK}">${escape(input.title)}</text>`,
    `<text x="${MARGIN}" y="${MARGIN + 16}" font-size="10" fill="${MUTED}">Exercise material. Highlighted: the equilibrium path under the assumed payoffs, an aid to discussion and not a prediction.</text>`,
    `<g transform="translate(${MARGIN},${MARGIN + 28})">`,
    ...edges,
    ...nodes,
    '</g>',
    '</svg>',
  ].join('');
}
