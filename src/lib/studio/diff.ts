/**
 * What changed between two versions of a scenario document, as JSON paths, for
 * the change log. A whole added or removed value is one path; the walk does not
 * descend into it.
 */
type Json = unknown;

const isRecord = (v: Json): v is Record<string, Json> => typeof v === 'object' && v !== null && !Array.isArray(v);

function join(path: string, key: string | number): string {
  if (typeof key === 'number') return `${path}[${key}]`;
  return path === '' ? key : `${path}.${key}`;
}

export const PATH_LIMIT = 200;

/** Paths where `before` and `after` differ, in document order; at most PATH_LIMIT of them. */
export function changedPaths(before: Json, after: Json, limit = PATH_LIMIT): string[] {
  const out: string[] = [];
  const walk = (a: Json, b: Json, path: string) => {
    if (out.length >= limit || a === b) return;
    if (Array.isArray(a) && Array.isArray(b)) {
      for (let i = 0; i < Math.max(a.length, b.length); i++) walk(a[i], b[i], join(path, i));
      return;
    }
    if (isRecord(a) && isRecord(b)) {
      const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
      for (const key of keys) walk(a[key], b[key], join(path, key));
      return;
    }
    out.push(path === '' ? '(whole document)' : path);
  };
  walk(before, after, '');
  return out;
}

/**
 * A line a person reads: the parts that changed, named by `partName` from the
 * first path segment, e.g. "Edited the ladder and the tree (14 places)".
 */
export function describeChange(paths: string[], partName: (segment: string) => string): string {
  if (paths.length === 0) return 'Saved without changes';
  const parts = [...new Set(paths.map((p) => partName(p.split(/[.[]/)[0]!)))];
  const list = parts.length === 1 ? parts[0]! : `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]!}`;
  const count = paths.length >= PATH_LIMIT ? `${PATH_LIMIT} or more places` : paths.length === 1 ? '1 place' : `${paths.length} places`;
  return `Edited ${list} (${count})`;
}
