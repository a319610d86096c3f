/**
 * Node ids derived from the path: the root is "n" and a child is its parent's id, a dot,
 * and a short key for the edge (e.g. "n.up1.hold"). A tree regenerated from an edited
 * ladder therefore keeps the id of every node whose path still exists.
 */
export const ROOT_ID = 'n';

/** A short, id-safe key for an edge label: "Climb 2: Blockade" becomes "climb-2-blockade". */
export function slug(label: string): string {
  const s = label
    .normalize('NFKD')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 32)
    .replace(/-+$/, '');
  return s === '' ? 'x' : s;
}

/** Keys for sibling edges, unique among the siblings (later duplicates get "-2", "-3", ...). */
export function siblingKeys(keys: string[]): string[] {
  const used = new Map<string, number>();
  return keys.map((key) => {
    const seen = used.get(key) ?? 0;
    used.set(key, seen + 1);
    return seen === 0 ? key : `${key}-${seen + 1}`;
  });
}

export function childId(parentId: string, key: string): string {
  return `${parentId}.${key}`;
}
