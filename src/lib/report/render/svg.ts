/** A chart drawing as inline SVG, for the HTML export. */
import type { Drawing, Shape } from './chart';

export const escapeXml = (value: string) =>
  value.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

const n = (v: number) => Number(v.toFixed(2));
const dash = (d?: number[]) => (d ? ` stroke-dasharray="${d.join(' ')}"` : '');

function shape(s: Shape): string {
  switch (s.kind) {
    case 'line':
      return `<line x1="${n(s.x1)}" y1="${n(s.y1)}" x2="${n(s.x2)}" y2="${n(s.y2)}" stroke="${s.stroke}" stroke-width="${s.width}"${dash(s.dash)}/>`;
    case 'path':
      return `<polyline fill="none" points="${s.points.map(([x, y]) => `${n(x)},${n(y)}`).join(' ')}" stroke="${s.stroke}" stroke-width="${s.width}" stroke-linejoin="round"${dash(s.dash)}/>`;
    case 'rect':
      return `<rect x="${n(s.x)}" y="${n(s.y)}" width="${n(s.w)}" height="${n(s.h)}" fill="${s.fill}"/>`;
    case 'dot':
      return `<circle cx="${n(s.cx)}" cy="${n(s.cy)}" r="${s.r}" fill="${s.fill}"${s.stroke ? ` stroke="${s.stroke}" stroke-width="1.4"` : ''}/>`;
    case 'text':
      return `<text x="${n(s.x)}" y="${n(s.y)}" font-size="${s.size}" text-anchor="${s.anchor}" fill="${s.fill}"${s.bold ? ' font-weight="600"' : ''}>${escapeXml(s.text)}</text>`;
  }
}

export function drawingToSvg(drawing: Drawing): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${drawing.width} ${drawing.height}" role="img" aria-label="${escapeXml(drawing.title)}" font-family="'Libre Franklin', sans-serif">${drawing.shapes.map(shape).join('')}</svg>`;
}
