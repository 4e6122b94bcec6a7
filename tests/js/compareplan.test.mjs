import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  boundTraces, branchingLists, followView, groupProgress, MAX_PANES, metricCells,
  overlapSentences, RUN_COLOURS, runColour, runLabel, runLetter, sharedScale, shownRuns,
} from '../../web/js/compareplan.js';
import { formatHash, parseHash } from '../../web/js/hashstate.js';

const near = (a, b, tol = 1e-9) => assert.ok(Math.abs(a - b) <= tol * Math.max(1, Math.abs(b)), `${a} vs ${b}`);

test('one scale for trees of different sizes: the widest and deepest fit, each centred', () => {
  // pane 1: 100 leaves wide, 10 deep; pane 2: 20 leaves, 30 deep; both 600 x 400 px
  const panes = [
    { xLo: 0, xHi: 100, yLo: 0, yHi: 10, width: 600, height: 400 },
    { xLo: 0, xHi: 20, yLo: 0, yHi: 30, width: 600, height: 400 },
  ];
  const { kx, ky, views } = sharedScale(panes, { pad: 20, padLeft: 40 });
  near(kx, (600 - 20 - 40) / 100); // by hand: 5.4 px per leaf, set by the wider tree
  near(ky, (400 - 40) / 30); // 12 px per depth, set by the deeper tree
  for (const [i, v] of views.entries()) {
    near(600 / (v.x1 - v.x0), kx); // same pixels per layout unit in both panes
    near(400 / (v.y1 - v.y0), ky);
    const mid = 0.5 * (panes[i].xLo + panes[i].xHi);
    near((mid - v.x0) * kx, 40 + (600 - 40) / 2); // centred right of the axis labels
    near((0 - v.y0) * ky, 20); // the roots share one top line
  }
});

test('a moved view carries its scale and offset to the other pane', () => {
  const a = { xLo: 0, xHi: 100, yLo: 0, yHi: 10, width: 600, height: 400 };
  const b = { xLo: 0, xHi: 20, yLo: 0, yHi: 30, width: 300, height: 400 };
  const view = { x0: 40, x1: 70, y0: 2, y1: 6 }; // 20 px per leaf, 100 px per depth in a
  const w = followView(view, a, b);
  near(300 / (w.x1 - w.x0), 20);
  near(400 / (w.y1 - w.y0), 100);
  near(w.x0 - 10, 40 - 50); // same offset from each tree's midline (50 and 10)
  assert.equal(w.y0, 2);
});

test('the chart has exactly one primal and one dual trace per run, in the run colour', () => {
  const series = { primal: { x: [0, 5], y: [3, 2] }, dual: { x: [0, 5], y: [1, 2] } };
  const traces = boundTraces([
    { id: 'r1', index: 0, label: 'most-fractional \u00b7 best-bound', series },
    { id: 'r2', index: 1, label: 'pseudocost \u00b7 hybrid', series },
  ]);
  assert.deepEqual(traces.map((t) => [t.meta.run, t.meta.side]),
    [['r1', 'primal'], ['r1', 'dual'], ['r2', 'primal'], ['r2', 'dual']]);
  assert.equal(traces[0].line.color, RUN_COLOURS[0]);
  assert.equal(traces[1].line.color, RUN_COLOURS[0]);
  assert.equal(traces[1].line.dash, 'dash');
  assert.equal(traces[2].line.color, RUN_COLOURS[1]);
  assert.equal(traces[0].name, 'A most-fractional \u00b7 best-bound: primal');
  assert.deepEqual(traces[3].y, [1, 2]);
});

test('letters, colours and labels', () => {
  assert.equal(runLetter(0), 'A');
  assert.equal(runLetter(3), 'D');
  assert.equal(runColour(RUN_COLOURS.length), RUN_COLOURS[0]);
  assert.equal(new Set(RUN_COLOURS).size, RUN_COLOURS.length);
  assert.equal(runLabel({ branching: 'reliability', select: 'hybrid', seed: 0 }), 'reliability \u00b7 hybrid');
  assert.equal(runLabel({ branching: 'random', select: 'hybrid', seed: 2 }), 'random \u00b7 hybrid \u00b7 seed 2');
});

test('table cells carry the server marks and readable values', () => {
  const table = {
    rows: [
      { run_id: 'a', status: 'optimal', nodes: 3651, lp_iterations: 9659, seconds: 0.93,
        first_incumbent_seconds: 0.0019, gap: 0, primal_integral: 0.001961, max_depth: 20 },
      { run_id: 'b', status: 'optimal', nodes: 2685, lp_iterations: 8622, seconds: 0.85,
        first_incumbent_seconds: null, gap: 0, primal_integral: null, max_depth: 26 },
    ],
    marks: [{ nodes: false, max_depth: true }, { nodes: true, max_depth: false }],
  };
  const cells = metricCells(table);
  const nodes = (r) => cells[r].cells.find((c) => c.key === 'nodes');
  assert.deepEqual(nodes(0), { key: 'nodes', text: '3,651', best: false });
  assert.deepEqual(nodes(1), { key: 'nodes', text: '2,685', best: true });
  assert.equal(cells[1].cells.find((c) => c.key === 'first_incumbent_seconds').text, '\u2014');
  assert.equal(cells[0].cells.find((c) => c.key === 'max_depth').best, true);
  assert.deepEqual(metricCells(null), []);
});

test('branching lists mark the variables every run favours', () => {
  const branched = [
    { run_id: 'a', branchings: 10, variables: 3, top: [{ name: 'x', count: 5, share: 0.5 }, { name: 'y', count: 3, share: 0.3 }] },
    { run_id: 'b', branchings: 8, variables: 2, top: [{ name: 'y', count: 6, share: 0.75 }, { name: 'z', count: 2, share: 0.25 }] },
  ];
  // the server's overlap for these lists (by hand): y in both; Jaccard {x,y} vs {y,z} = 1/3
  const overlap = { common: ['y'], in_runs: { x: 1, y: 2, z: 1 }, pairs: [{ a: 0, b: 1, shared: ['y'], jaccard: 1 / 3 }] };
  const lists = branchingLists(branched, overlap);
  assert.deepEqual(lists[0].top.map((v) => [v.name, v.inAll]), [['x', false], ['y', true]]);
  assert.deepEqual(lists[1].top.map((v) => v.inRuns), [2, 1]);
  const text = overlapSentences(branched, overlap, (id) => id.toUpperCase());
  assert.deepEqual(text, ['1 variable is in every run\u2019s top 2: y.',
    'Shared by two runs (Jaccard index of their lists): A and B 1 (0.33).']);
  assert.equal(overlapSentences(branched, overlap, String, () => false).length, 1);
  assert.equal(branchingLists(branched, null)[0].top[1].inAll, false);
  assert.match(overlapSentences(branched, null, String)[0], /different models/);
});

test('shown runs and group progress', () => {
  const ids = ['a', 'b', 'c', 'd', 'e', 'a'];
  assert.deepEqual(shownRuns(ids), ['a', 'b', 'c', 'd'].slice(0, MAX_PANES));
  assert.deepEqual(shownRuns(ids, ['e', 'zz', 'b']), ['e', 'b']);
  const group = { ended: 1, total: 3, members: [{ state: 'finished' }, { state: 'running' }, { state: 'queued' }] };
  assert.equal(groupProgress(group), '1 of 3 runs ended \u00b7 1 running \u00b7 1 queued');
});

test('the fragment holds a comparison or a group', () => {
  const s = parseHash('#compare=a.b.c,d-e,a.b.c&axis=time');
  assert.deepEqual(s.compare, ['a.b.c', 'd-e']);
  assert.equal(s.axis, 'time');
  assert.equal(s.run, null);
  assert.deepEqual(parseHash(formatHash(s)), s);
  const g = parseHash('#group=compare-x-20250101T000000');
  assert.equal(g.group, 'compare-x-20250101T000000');
  assert.equal(formatHash(g), '#group=compare-x-20250101T000000');
  assert.equal(parseHash('#compare=').compare, null);
});
