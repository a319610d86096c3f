/**
 * An issued report as HTML: the document body (also shown on the report page)
 * and a standalone file with the fonts inlined, the EXERCISE marking at top
 * and bottom, and the caution about assumed payoffs.
 */
import { readFigure, readTable, type TableSpec } from '../figures';
import type { JSONContent } from '../schema';
import { drawFigure } from './chart';
import { fontFile, faceOf, subsetRanges, type FontStyle } from './fonts';
import { CAUTION, EXERCISE_MARKING, issuedLine, type IssuedReport } from './issued';
import { drawingToSvg, escapeXml as escape } from './svg';

const SAFE_HREF = /^(https?:|mailto:)/i;

function marks(text: string, list: JSONContent['marks'] = []): string {
  return list.reduce((html, mark) => {
    switch (mark.type) {
      case 'bold':
        return `<strong>${html}</strong>`;
      case 'italic':
        return `<em>${html}</em>`;
      case 'underline':
        return `<u>${html}</u>`;
      case 'strike':
        return `<s>${html}</s>`;
      case 'code':
        return `<code>${html}</code>`;
      case 'link': {
        const href = String(mark.attrs?.href ?? '');
        return SAFE_HREF.test(href) ? `<a href="${escape(href)}">${html}</a>` : html;
      }
      default:
        return html;
    }
  }, escape(text));
}

function tableHtml(spec: TableSpec): string {
  const align = (i: number) => (spec.numeric.includes(i) ? ' class="num"' : '');
  const head = spec.columns.map((c, i) => `<th${align(i)}>${escape(c)}</th>`).join('');
  const body = spec.rows.map((row) => `<tr>${row.map((cell, i) => `<td${align(i)}>${escape(cell === null ? '—' : String(cell))}</td>`).join('')}</tr>`).join('');
  const empty = spec.rows.length === 0 ? `<tr><td colspan="${spec.columns.length}" class="none">None.</td></tr>` : '';
  return `<figure class="analysis-table"><figcaption>${escape(spec.title)}</figcaption><table><thead><tr>${head}</tr></thead><tbody>${body}${empty}</tbody></table>${spec.note ? `<p class="note">${escape(spec.note)}</p>` : ''}</figure>`;
}

const unreadable = (what: string) => `<p class="unreadable">This ${what} could not be read from the document.</p>`;

function node(n: JSONContent): string {
  const inner = () => (n.content ?? []).map(node).join('');
  switch (n.type) {
    case 'doc':
      return inner();
    case 'text':
      return marks(n.text ?? '', n.marks);
    case 'paragraph':
      return n.content?.length ? `<p>${inner()}</p>` : '';
    case 'heading': {
      const level = Math.min(Math.max(Number(n.attrs?.level) || 2, 1), 4);
      return `<h${level}>${inner()}</h${level}>`;
    }
    case 'bulletList':
      return `<ul>${inner()}</ul>`;
    case 'orderedList':
      return `<ol start="${Number(n.attrs?.start) || 1}">${inner()}</ol>`;
    case 'listItem':
      return `<li>${inner()}</li>`;
    case 'blockquote':
      return `<blockquote>${inner()}</blockquote>`;
    case 'codeBlock':
      return `<pre><code>${inner()}</code></pre>`;
    case 'horizontalRule':
      return '<hr>';
    case 'hardBreak':
      return '<br>';
    case 'analysisFigure': {
      const spec = readFigure(n.attrs?.spec);
      if (!spec) return unreadable('figure');
      return `<figure class="analysis-figure">${drawingToSvg(drawFigure(spec))}<figcaption>${escape(spec.title)}</figcaption></figure>`;
    }
    case 'analysisTable': {
      const spec = readTable(n.attrs?.spec);
      return spec ? tableHtml(spec) : unreadable('table');
    }
    default:
      return inner();
  }
}

/** The document as HTML, without a page around it. */
export function reportBodyHtml(content: JSONContent): string {
  return node(content);
}

const INLINE_STYLES: FontStyle[] = ['regular', 'italic', 'semibold', 'bold', 'boldItalic'];

function fontFaces(): string {
  const ranges = subsetRanges();
  return (['latin', 'latin-ext'] as const)
    .flatMap((subset) =>
      INLINE_STYLES.map((style) => {
        const face = faceOf(style);
        const range = ranges.get(subset)!.map(([a, b]) => (a === b ? `U+${a.toString(16)}` : `U+${a.toString(16)}-${b.toString(16)}`)).join(',');
        const data = fontFile(subset, style, 'woff2').toString('base64');
        return `@font-face{font-family:'Libre Franklin';font-style:${face.style};font-weight:${face.weight};src:url(data:font/woff2;base64,${data}) format('woff2');unicode-range:${range}}`;
      }),
    )
    .join('\n');
}

const REPORT_CSS = `
body{margin:0;background:#f7f5f0;color:#18212b;font:15px/1.55 'Libre Franklin',sans-serif}
.marking{background:#7a4b13;color:#fff;text-align:center;font-size:11px;font-weight:600;letter-spacing:.3em;padding:3px 0}
main{max-width:760px;margin:0 auto;padding:28px 24px 40px;background:#fff}
.meta{color:#4a5868;font-size:13px;margin:0 0 12px}
.caution{border-left:4px solid #b06f1e;background:#f6ead8;padding:8px 12px;font-size:13px;margin:0 0 24px}
h1{font-size:26px;line-height:1.2;margin:8px 0 6px;font-weight:600}
h2{font-size:19px;margin:28px 0 8px;font-weight:600;border-bottom:1px solid #d6dce2;padding-bottom:3px}
h3{font-size:16px;margin:20px 0 6px;font-weight:600}
blockquote{border-left:3px solid #b3bdc7;margin:0 0 12px;padding:2px 12px;color:#34414f}
pre{background:#f4f6f7;padding:8px 12px;overflow:auto}
figure{margin:16px 0}
figcaption{font-size:13px;font-weight:600;margin:0 0 6px}
.analysis-figure figcaption{margin-top:4px}
.analysis-figure svg{width:100%;height:auto;display:block}
table{border-collapse:collapse;width:100%;font-size:12.5px}
th{text-align:left;border-bottom:1.5px solid #647384;padding:4px 6px;font-weight:600}
td{border-bottom:1px solid #e9edf0;padding:4px 6px;vertical-align:top}
.num{text-align:right;font-variant-numeric:tabular-nums}
.note{font-size:12px;color:#4a5868;margin:4px 0 0}
.none,.unreadable{color:#647384;font-style:italic}
`;

/** A standalone HTML file of an issued version. */
export function reportHtml(report: IssuedReport): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escape(report.title)} · version ${report.number}</title>
<style>${fontFaces()}${REPORT_CSS}</style></head>
<body>
<div class="marking" role="note">${EXERCISE_MARKING}</div>
<main>
<p class="meta">${escape(issuedLine(report))}</p>
<p class="caution">${escape(CAUTION)}</p>
${reportBodyHtml(report.content)}
</main>
<div class="marking" role="note">${EXERCISE_MARKING}</div>
</body></html>
`;
}
