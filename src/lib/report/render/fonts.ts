/**
 * The shipped Libre Franklin files (@fontsource/libre-franklin), split by
 * Unicode subset as the package ships them. Exports pick, for each character,
 * the subset that covers it, as a browser does with unicode-range.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';

export type FontStyle = 'regular' | 'italic' | 'semibold' | 'bold' | 'boldItalic';

/** In order of preference: a character goes to the first subset that covers it. */
export const SUBSETS = ['latin', 'latin-ext', 'vietnamese', 'cyrillic', 'cyrillic-ext'] as const;
export type Subset = (typeof SUBSETS)[number];

const FACES: Record<FontStyle, { weight: number; style: 'normal' | 'italic' }> = {
  regular: { weight: 400, style: 'normal' },
  italic: { weight: 400, style: 'italic' },
  semibold: { weight: 600, style: 'normal' },
  bold: { weight: 700, style: 'normal' },
  boldItalic: { weight: 700, style: 'italic' },
};

export const REPLACEMENT = '\uFFFD';

let packageDir: string | null = null;
function fontDir(): string {
  packageDir ??= dirname(createRequire(import.meta.url).resolve('@fontsource/libre-franklin/package.json'));
  return packageDir;
}

export function faceOf(style: FontStyle) {
  return FACES[style];
}

function fontPath(subset: Subset, style: FontStyle, format: 'woff' | 'woff2'): string {
  const face = FACES[style];
  return join(fontDir(), 'files', `libre-franklin-${subset}-${face.weight}-${face.style}.${format}`);
}

const files = new Map<string, Buffer>();
export function fontFile(subset: Subset, style: FontStyle, format: 'woff' | 'woff2'): Buffer {
  const path = fontPath(subset, style, format);
  let file = files.get(path);
  if (!file) {
    file = readFileSync(path);
    files.set(path, file);
  }
  return file;
}

type Range = [number, number];
let ranges: Map<Subset, Range[]> | null = null;

/** The unicode-range of every subset, from the package's unicode.json ("U+0000-00FF,U+0131,..."). */
export function subsetRanges(): Map<Subset, Range[]> {
  if (ranges) return ranges;
  const table = JSON.parse(readFileSync(join(fontDir(), 'unicode.json'), 'utf8')) as Record<string, string>;
  ranges = new Map(
    SUBSETS.map((subset) => [
      subset,
      (table[subset] ?? '').split(',').map((part): Range => {
        const [from, to] = part.trim().replace(/^U\+/i, '').split('-');
        return [parseInt(from!, 16), parseInt(to ?? from!, 16)];
      }),
    ]),
  );
  return ranges;
}

export function subsetOf(codePoint: number): Subset | null {
  for (const [subset, list] of subsetRanges()) if (list.some(([a, b]) => codePoint >= a && codePoint <= b)) return subset;
  return null;
}

/** Text cut into runs that one subset covers; characters no subset covers become U+FFFD. */
export function splitBySubset(text: string): { subset: Subset; text: string }[] {
  const runs: { subset: Subset; text: string }[] = [];
  for (const char of text) {
    const found = subsetOf(char.codePointAt(0)!);
    const subset = found ?? 'latin';
    const piece = found ? char : REPLACEMENT;
    const last = runs.at(-1);
    if (last && last.subset === subset) last.text += piece;
    else runs.push({ subset, text: piece });
  }
  return runs;
}
