import { describe, expect, it } from 'vitest';
import { type GameNode } from '../../../src/lib/engine';
import { initialCollapse, visibleTree } from '../../../src/lib/studio/tree-view';
import { treeSvg } from '../../../src/lib/studio/tree-svg';

/** A complete tree with `branching` actions per decision and `depth` levels of decisions. */
function complete(depth: number, branching: number, id = 'n'): GameNode {
  if (depth === 0) return { id, kind: 'terminal', payoffs: { a: 0, b: 0 } };
  return {
    id,
    kind: 'decision',
    team: depth % 2 ? 'a' : 'b',
    actions: Array.from({ length: branching }, (_, i) => ({ label: `Move ${i}`, next: complete(depth - 1, branching, `${id}.m${i}`) })),
  };
}

describe('studio: what the canvas shows', () => {
  it('lists nodes in preorder with depth, parent and edge label', () => {
    const view = visibleTree(complete(2, 2), new Set());
    expect(view.total).toBe(7);
    expect(view.nodes.map((v) => v.id)).toEqual(['n', 'n.m0', 'n.m0.m0', 'n.m0.m1', 'n.m1', 'n.m1.m0', 'n.m1.m1']);
    expect(view.byId.get('n.m1.m0')).toMatchObject({ depth: 2, parentId: 'n.m1', edgeLabel: 'Move 0', collapsed: false });
  });

  it('hides what is under a collapsed node and counts it', () => {
    const view = visibleTree(complete(3, 2), new Set(['n.m0']));
    expect(view.byId.get('n.m0')).toMatchObject({ collapsed: true, hidden: 6, childIds: [] });
    expect(view.nodes).toHaveLength(15 - 6);
  });

  it('opens large trees collapsed under the limit', () => {
    const root = complete(8, 3); // 9,841 nodes
    const collapsed = initialCollapse(root, 2_000);
    const view = visibleTree(root, collapsed);
    expect(view.total).toBe(9_841);
    expect(view.nodes.length).toBeLessThanOrEqual(2_000);
    expect(view.nodes.length).toBe(1 + 3 + 9 + 27 + 81 + 243 + 729);
    expect(initialCollapse(complete(3, 2), 2_000).size).toBe(0);
  });

  it('draws the visible tree as SVG with the path highlighted and the caution', () => {
    const root = complete(1, 2);
    const view = visibleTree(root, new Set());
    const boxes = new Map(view.nodes.map((v, i) => [v.id, { x: v.depth * 300, y: i * 80, width: 184, height: 56 }]));
    const svg = treeSvg({
      view,
      boxes,
      teamNames: new Map([['a', 'Azure'], ['b', 'Crimson <b>']]),
      payoffs: new Map([['n.m0', ['1', '2']], ['n.m1', ['0', '0']]]),
      path: new Set(['n', 'n.m0']),
      title: 'Test & tree',
    });
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toContain('Test &#38; tree');
    expect(svg).toContain('Crimson &#60;b&#62;: 2');
    expect(svg).toContain('not a prediction');
    expect(svg.match(/stroke="#935b17"/g)).toHaveLength(3); // root, chosen outcome, the edge between them
  });
});
