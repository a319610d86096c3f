/**
 * An issued report as PDF, made on the server with pdfkit and the shipped
 * Libre Franklin files (WOFF; pdfkit embeds the glyphs used). Charts are
 * painted as vector paths from the same drawings the HTML export uses. Every
 * page carries the EXERCISE marking at top and bottom; the first page carries
 * the caution about assumed payoffs.
 */
import PDFDocument from 'pdfkit';
import { readFigure, readTable, type TableSpec } from '../figures';
import type { JSONContent } from '../schema';
import { drawFigure, type Drawing } from './chart';
import { fontFile, splitBySubset, type FontStyle } from './fonts';
import { CAUTION, EXERCISE_MARKING, issuedLine, type IssuedReport } from './issued';

type Doc = PDFKit.PDFDocument;

const PAGE = { margin: 56, top: 58, bottom: 62 };
const INK = '#18212b';
const MUTED = '#4a5868';
const RULE = '#d6dce2';
const BAND = '#7a4b13';
const BODY_SIZE = 10.5;

type Run = { text: string; style: FontStyle; color?: string; underline?: boolean; strike?: boolean; link?: string };

class Writer {
  private readonly registered = new Set<string>();

  constructor(readonly doc: Doc) {}

  get left() {
    return this.doc.page.margins.left;
  }
  get width() {
    return this.doc.page.width - this.doc.page.margins.left - this.doc.page.margins.right;
  }
  get bottom() {
    return this.doc.page.height - this.doc.page.margins.bottom;
  }

  font(style: FontStyle, subset: Parameters<typeof fontFile>[0] = 'latin'): Doc {
    const name = `${style}:${subset}`;
    if (!this.registered.has(name)) {
      this.doc.registerFont(name, fontFile(subset, style, 'woff'));
      this.registered.add(name);
    }
    return this.doc.font(name);
  }

  /** Start a new page when fewer than `height` points are left on this one. */
  keep(height: number): void {
    if (this.doc.y + height > this.bottom) this.doc.addPage();
  }

  /** Write runs as one flowing block; pieces go to the font subset that covers them. */
  runs(runs: Run[], options: { x?: number; y?: number; width: number; size: number; color?: string; lineGap?: number; align?: 'left' | 'right' }): void {
    const pieces = runs.flatMap((run) => splitBySubset(run.text).map((part) => ({ ...run, text: part.text, subset: part.subset })));
    if (pieces.length === 0) return;
    pieces.forEach((piece, k) => {
      this.font(piece.style, piece.subset).fontSize(options.size).fillColor(piece.color ?? options.color ?? INK);
      const textOptions: PDFKit.Mixins.TextOptions = {
        continued: k < pieces.length - 1,
        width: options.width,
        lineGap: options.lineGap ?? 2.5,
        align: options.align ?? 'left',
        underline: piece.underline ?? false,
        strike: piece.strike ?? false,
        link: piece.link ?? null,
      };
      if (k === 0 && options.x !== undefined) this.doc.text(piece.text, options.x, options.y ?? this.doc.y, textOptions);
      else this.doc.text(piece.text, textOptions);
    });
  }

  /** One line of text placed exactly (baseline at y), for charts and page furniture. */
  label(text: string, x: number, y: number, options: { size: number; style?: FontStyle; color: string; anchor?: 'start' | 'middle' | 'end' }): void {
    const parts = splitBySubset(text);
    const style = options.style ?? 'regular';
    const widthOf = (part: (typeof parts)[number]) =>
      this.font(style, part.subset).fontSize(options.size).widthOfString(part.text);
    const total = parts.reduce((sum, p) => sum + widthOf(p), 0);
    let at = options.anchor === 'middle' ? x - total / 2 : options.anchor === 'end' ? x - total : x;
    for (const part of parts) {
      this.font(style, part.subset).fontSize(options.size).fillColor(options.color);
      this.doc.text(part.text, at, y, { lineBreak: false, baseline: 'alphabetic' });
      at += widthOf(part);
    }
  }
}

function styleOf(marks: JSONContent['marks'] = []): FontStyle {
  const bold = marks.some((m) => m.type === 'bold');
  const italic = marks.some((m) => m.type === 'italic');
  return bold && italic ? 'boldItalic' : bold ? 'bold' : italic ? 'italic' : 'regular';
}

function inlineRuns(content: JSONContent[] = [], base: Partial<Run> = {}): Run[] {
  return content.flatMap((n): Run[] => {
    if (n.type === 'hardBreak') return [{ text: '\n', style: 'regular' }];
    if (n.type !== 'text' || !n.text) return [];
    const link = n.marks?.find((m) => m.type === 'link')?.attrs?.href;
    const style = base.style === 'italic' && styleOf(n.marks) === 'regular' ? 'italic' : styleOf(n.marks);
    return [
      {
        text: n.text,
        style,
        color: n.marks?.some((m) => m.type === 'code') ? MUTED : base.color,
        underline: n.marks?.some((m) => m.type === 'underline') || typeof link === 'string',
        strike: n.marks?.some((m) => m.type === 'strike'),
        link: typeof link === 'string' && /^(https?:|mailto:)/i.test(link) ? link : undefined,
      },
    ];
  });
}

type Block = { indent: number; base?: Partial<Run> };

function paragraph(w: Writer, n: JSONContent, block: Block): void {
  const runs = inlineRuns(n.content, block.base);
  if (runs.length === 0) return;
  w.keep(BODY_SIZE * 2.4);
  w.runs(runs, { x: w.left + block.indent, width: w.width - block.indent, size: BODY_SIZE, color: block.base?.color });
  w.doc.moveDown(0.45);
}

const HEADING = { 1: { size: 19, gap: 0.3 }, 2: { size: 14, gap: 0.25 }, 3: { size: 12, gap: 0.2 } } as const;

function heading(w: Writer, n: JSONContent): void {
  const level = (Math.min(Math.max(Number(n.attrs?.level) || 2, 1), 3)) as 1 | 2 | 3;
  const { size, gap } = HEADING[level];
  w.keep(size * 2 + 60);
  if (level > 1) w.doc.moveDown(0.6);
  w.runs(inlineRuns(n.content).map((r) => ({ ...r, style: 'semibold' })), { x: w.left, width: w.width, size });
  if (level === 2) {
    const y = w.doc.y + 1;
    w.doc.moveTo(w.left, y).lineTo(w.left + w.width, y).lineWidth(0.6).strokeColor(RULE).stroke();
    w.doc.y = y + 4;
  }
  w.doc.moveDown(gap);
}

function list(w: Writer, n: JSONContent, block: Block, ordered: boolean): void {
  const start = Number(n.attrs?.start) || 1;
  (n.content ?? []).forEach((item, k) => {
    const indent = block.indent + 16;
    w.keep(BODY_SIZE * 2.4);
    const y = w.doc.y;
    w.font('regular').fontSize(BODY_SIZE).fillColor(MUTED);
    w.doc.text(ordered ? `${start + k}.` : '•', w.left + block.indent, y, { width: 14, align: ordered ? 'right' : 'left', lineBreak: false });
    w.doc.x = w.left + indent;
    w.doc.y = y;
    (item.content ?? []).forEach((child, c) => {
      if (c === 0 && child.type === 'paragraph') {
        w.runs(inlineRuns(child.content), { x: w.left + indent, y, width: w.width - indent, size: BODY_SIZE });
        w.doc.moveDown(0.25);
      } else blockNode(w, child, { indent });
    });
  });
  w.doc.moveDown(0.3);
}

function paint(w: Writer, drawing: Drawing, x: number, y: number, scale: number): void {
  const { doc } = w;
  const X = (v: number) => x + v * scale;
  const Y = (v: number) => y + v * scale;
  for (const s of drawing.shapes) {
    doc.save();
    if (s.kind === 'line' || s.kind === 'path') {
      const points = s.kind === 'line' ? ([[s.x1, s.y1], [s.x2, s.y2]] as [number, number][]) : s.points;
      doc.moveTo(X(points[0]![0]), Y(points[0]![1]));
      for (const [px, py] of points.slice(1)) doc.lineTo(X(px), Y(py));
      doc.lineWidth(s.width * scale).lineJoin('round').strokeColor(s.stroke);
      if (s.dash) doc.dash(s.dash[0]! * scale, { space: (s.dash[1] ?? s.dash[0]!) * scale });
      doc.stroke();
      doc.undash();
    } else if (s.kind === 'rect') {
      doc.rect(X(s.x), Y(s.y), s.w * scale, s.h * scale).fill(s.fill);
    } else if (s.kind === 'dot') {
      doc.circle(X(s.cx), Y(s.cy), s.r * scale).lineWidth(1.2 * scale);
      if (s.stroke) doc.fillAndStroke(s.fill, s.stroke);
      else doc.fill(s.fill);
    } else {
      w.label(s.text, X(s.x), Y(s.y), { size: s.size * scale, style: s.bold ? 'semibold' : 'regular', color: s.fill, anchor: s.anchor });
    }
    doc.restore();
  }
}

function figure(w: Writer, n: JSONContent): void {
  const spec = readFigure(n.attrs?.spec);
  if (!spec) return unreadable(w, 'figure');
  const drawing = drawFigure(spec);
  const scale = w.width / drawing.width;
  const height = drawing.height * scale;
  w.keep(height + 34);
  w.doc.moveDown(0.3);
  const top = w.doc.y;
  paint(w, drawing, w.left, top, scale);
  w.doc.y = top + height + 4;
  w.runs([{ text: spec.title, style: 'semibold' }], { x: w.left, width: w.width, size: 9, color: MUTED });
  w.doc.moveDown(0.8);
}

function columnWidths(w: Writer, spec: TableSpec, size: number): number[] {
  const natural = spec.columns.map((c, i) => {
    w.font('semibold').fontSize(size);
    let widest = w.doc.widthOfString(c);
    w.font('regular').fontSize(size);
    for (const row of spec.rows.slice(0, 200)) widest = Math.max(widest, w.doc.widthOfString(String(row[i] ?? '—')));
    return Math.min(widest, 220) + 10;
  });
  const total = natural.reduce((a, b) => a + b, 0);
  return natural.map((v) => (v / total) * w.width);
}

function table(w: Writer, n: JSONContent): void {
  const spec = readTable(n.attrs?.spec);
  if (!spec) return unreadable(w, 'table');
  const size = 8.5;
  const widths = columnWidths(w, spec, size);
  const pad = 4;
  const cellText = (cell: string | number | null) => (cell === null ? '—' : String(cell));
  const rowHeight = (cells: string[], style: FontStyle) =>
    Math.max(...cells.map((c, i) => w.font(style).fontSize(size).heightOfString(c, { width: widths[i]! - 2 * pad, lineGap: 1.5 }))) + 2 * pad;
  const drawRow = (cells: string[], style: FontStyle, rule: { color: string; width: number }) => {
    const y = w.doc.y;
    const height = rowHeight(cells, style);
    let x = w.left;
    cells.forEach((c, i) => {
      const align = spec.numeric.includes(i) ? 'right' : 'left';
      w.runs([{ text: c, style }], { x: x + pad, y: y + pad, width: widths[i]! - 2 * pad, size, lineGap: 1.5, align });
      x += widths[i]!;
    });
    w.doc.moveTo(w.left, y + height).lineTo(w.left + w.width, y + height).lineWidth(rule.width).strokeColor(rule.color).stroke();
    w.doc.x = w.left;
    w.doc.y = y + height;
  };
  const header = () => drawRow(spec.columns, 'semibold', { color: '#647384', width: 1 });
  w.keep(60);
  w.doc.moveDown(0.3);
  w.runs([{ text: spec.title, style: 'semibold' }], { x: w.left, width: w.width, size: 10 });
  w.doc.moveDown(0.2);
  header();
  const rows = spec.rows.length ? spec.rows.map((r) => r.map(cellText)) : [['None.', ...spec.columns.slice(1).map(() => '')]];
  for (const cells of rows) {
    if (w.doc.y + rowHeight(cells, 'regular') > w.bottom) {
      w.doc.addPage();
      header();
    }
    drawRow(cells, 'regular', { color: '#e9edf0', width: 0.6 });
  }
  if (spec.note) {
    w.doc.moveDown(0.3);
    w.runs([{ text: spec.note, style: 'italic' }], { x: w.left, width: w.width, size: 8.5, color: MUTED });
  }
  w.doc.moveDown(0.8);
}

function unreadable(w: Writer, what: string): void {
  w.runs([{ text: `This ${what} could not be read from the document.`, style: 'italic' }], { x: w.left, width: w.width, size: BODY_SIZE, color: MUTED });
  w.doc.moveDown(0.5);
}

function blockNode(w: Writer, n: JSONContent, block: Block): void {
  switch (n.type) {
    case 'paragraph':
      return paragraph(w, n, block);
    case 'heading':
      return heading(w, n);
    case 'bulletList':
      return list(w, n, block, false);
    case 'orderedList':
      return list(w, n, block, true);
    case 'blockquote': {
      const top = w.doc.y;
      const page = w.doc.page;
      for (const child of n.content ?? []) blockNode(w, child, { indent: block.indent + 14, base: { style: 'italic', color: '#34414f' } });
      if (w.doc.page === page) w.doc.moveTo(w.left + block.indent + 3, top).lineTo(w.left + block.indent + 3, w.doc.y - 6).lineWidth(2).strokeColor('#b3bdc7').stroke();
      return;
    }
    case 'codeBlock':
      return paragraph(w, n, { indent: block.indent + 10, base: { color: MUTED } });
    case 'horizontalRule': {
      w.doc.moveDown(0.4);
      const y = w.doc.y;
      w.doc.moveTo(w.left, y).lineTo(w.left + w.width, y).lineWidth(0.6).strokeColor(RULE).stroke();
      w.doc.moveDown(0.8);
      return;
    }
    case 'analysisFigure':
      return figure(w, n);
    case 'analysisTable':
      return table(w, n);
    default:
      for (const child of n.content ?? []) blockNode(w, child, block);
  }
}

function frontMatter(w: Writer, report: IssuedReport): void {
  w.runs([{ text: issuedLine(report), style: 'regular' }], { x: w.left, y: w.doc.y, width: w.width, size: 9, color: MUTED });
  w.doc.moveDown(0.6);
  const top = w.doc.y;
  const inset = 10;
  const height = w.font('regular').fontSize(9).heightOfString(CAUTION, { width: w.width - 2 * inset - 4, lineGap: 2 }) + 2 * inset;
  w.doc.rect(w.left, top, w.width, height).fill('#f6ead8');
  w.doc.rect(w.left, top, 3.5, height).fill('#b06f1e');
  w.runs([{ text: CAUTION, style: 'regular' }], { x: w.left + inset + 4, y: top + inset, width: w.width - 2 * inset - 4, size: 9, lineGap: 2 });
  w.doc.x = w.left;
  w.doc.y = top + height + 16;
}

/** The marking band at the top and bottom of every page, and the page count. */
function pageFurniture(w: Writer, report: IssuedReport): void {
  const range = w.doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    w.doc.switchToPage(i);
    const { width, height } = w.doc.page;
    const margins = { ...w.doc.page.margins };
    w.doc.page.margins.bottom = 0; // writing below the bottom margin must not start a new page
    for (const y of [0, height - 16]) {
      w.doc.rect(0, y, width, 16).fill(BAND);
      // No letter spacing: text extraction and screen readers must read the word EXERCISE.
      w.label(EXERCISE_MARKING, width / 2, y + 11, { size: 8, style: 'semibold', color: '#ffffff', anchor: 'middle' });
    }
    w.label(`${report.title} · version ${report.number}`, PAGE.margin, height - 30, { size: 7.5, color: MUTED });
    w.label(`Page ${i - range.start + 1} of ${range.count}`, width - PAGE.margin, height - 30, { size: 7.5, color: MUTED, anchor: 'end' });
    w.doc.page.margins = margins;
  }
}

export function reportPdf(report: IssuedReport): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    bufferPages: true,
    margins: { top: PAGE.top, bottom: PAGE.bottom, left: PAGE.margin, right: PAGE.margin },
    info: { Title: `${report.title} (version ${report.number})`, Author: report.issuedByName, Subject: 'EXERCISE: after-action report', Creator: 'Rungwise' },
    autoFirstPage: true,
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const w = new Writer(doc);
  frontMatter(w, report);
  blockNode(w, report.content, { indent: 0 });
  pageFurniture(w, report);
  doc.end();
  return done;
}
