/**
 * Proper subgames: a non-terminal node roots one when every information set with a
 * member in its subtree lies entirely in that subtree.
 */
import { TERMINAL, type FlatGame } from './compile';

export function properSubgameRoots(flat: FlatGame): Uint8Array {
  const { size, mover, childStart, aux } = flat;
  const pre = depthFirstOrder(flat);
  const last = new Int32Array(size);
  const lo = new Int32Array(flat.infosetCount).fill(size);
  const hi = new Int32Array(flat.infosetCount).fill(-1);
  for (let i = 0; i < size; i++) {
    if (mover[i]! < 0) continue;
    const h = aux[i]!;
    lo[h] = Math.min(lo[h]!, pre[i]!);
    hi[h] = Math.max(hi[h]!, pre[i]!);
  }
  const subLo = new Int32Array(size);
  const subHi = new Int32Array(size);
  const roots = new Uint8Array(size);
  for (let i = size - 1; i >= 0; i--) {
    let l = mover[i]! >= 0 ? lo[aux[i]!]! : size;
    let h = mover[i]! >= 0 ? hi[aux[i]!]! : -1;
    let end = pre[i]!;
    for (let c = childStart[i]!; c < childStart[i + 1]!; c++) {
      l = Math.min(l, subLo[c]!);
      h = Math.max(h, subHi[c]!);
      end = Math.max(end, last[c]!);
    }
    subLo[i] = l;
    subHi[i] = h;
    last[i] = end;
    roots[i] = mover[i] !== TERMINAL && l >= pre[i]! && h <= end ? 1 : 0;
  }
  return roots;
}

/** Depth-first preorder numbers of the nodes of a flat game. */
function depthFirstOrder(flat: FlatGame): Int32Array {
  const pre = new Int32Array(flat.size);
  const stack = [0];
  let counter = 0;
  while (stack.length > 0) {
    const i = stack.pop()!;
    pre[i] = counter++;
    for (let c = flat.childStart[i + 1]! - 1; c >= flat.childStart[i]!; c--) stack.push(c);
  }
  return pre;
}
