import { test } from 'node:test';
import assert from 'node:assert/strict';
import { formatHash, parseHash } from '../../web/js/hashstate.js';
import { actionFor, keyLabel, SHORTCUTS } from '../../web/js/keys.js';
import { shapeSvgPath, traceShape } from '../../web/js/shapes.js';
import { STATUS_NAMES, STATUS_STYLE, statusReason } from '../../web/js/statuses.js';
import {
  centreOn, clampView, fitView, niceStep, panBy, sameView, viewFromText, viewToText, zoomAt,
} from '../../web/js/view.js';

test('the URL fragment round-trips', () => {
  const s = parseHash('#run=project-selection.reliability.hybrid&node=42&layout=bound&view=1,2,3,4&tab=closed&axis=time');
  assert.equal(s.run, 'project-selection.reliability.hybrid');
  assert.equal(s.node, 42);
  assert.equal(s.layout, 'bound');
  assert.equal(s.tab, 'closed');
  assert.equal(s.axis, 'time');
  assert.equal(parseHash(formatHash(s)).view, '1,2,3,4');
  assert.deepEqual(parseHash(formatHash(s)), s);
  const d = parseHash('#layout=sideways&node=abc');
  assert.equal(d.layout, 'depth');
  assert.equal(d.node, null);
  assert.equal(formatHash({ run: null }), '#');
});

test('views: fit, zoom about a point, pan, clamp, text form', () => {
  const v = fitView(0, 100, 0, 10, 1000, 500, 0);
  assert.deepEqual(v, { x0: 0, x1: 100, y0: 0, y1: 10 });
  const z = zoomAt(v, 2, 1, 250, 0, 1000, 500); // about x = 25
  assert.equal(z.x0, 12.5);
  assert.equal(z.x1, 62.5);
  const p = panBy(v, 100, 0, 1000, 500); // content moves right: view moves left by 10
  assert.equal(p.x0, -10);
  const c = clampView({ x0: 0, x1: 0.01, y0: 0, y1: 1 }, { minX: 1 });
  assert.ok(Math.abs(c.x1 - c.x0 - 1) < 1e-12);
  assert.deepEqual(centreOn(v, 10, 2), { x0: -40, x1: 60, y0: -3, y1: 7 });
  const back = viewFromText(viewToText({ x0: 1.5, x1: 2.25, y0: -3, y1: 4 }));
  assert.ok(sameView(back, { x0: 1.5, x1: 2.25, y0: -3, y1: 4 }));
  assert.equal(viewFromText('1,2,x,4'), null);
  assert.equal(viewFromText('2,1,0,1'), null);
  assert.equal(niceStep(7.3), 10);
  assert.equal(niceStep(0.0031), 0.005);
  assert.equal(niceStep(0.4, true), 1);
});

test('every status has a colour, a distinct shape and a reason', () => {
  assert.equal(STATUS_STYLE.length, STATUS_NAMES.length);
  const shapes = new Set(STATUS_STYLE.map((s) => s.shape));
  const colours = new Set(STATUS_STYLE.map((s) => s.colour));
  assert.equal(shapes.size, STATUS_NAMES.length);
  assert.equal(colours.size, STATUS_NAMES.length);
  for (const name of STATUS_NAMES) {
    assert.ok(statusReason({ status: name, bound: 3, fractional: 2 }, { incumbent: 2 }).length > 20, name);
  }
  assert.match(statusReason({ status: 'pruned', bound: 5 }, { incumbent: 4, sense: 'min' }), /not lower/);
});

test('shapes trace closed paths; svg paths come out for every shape', () => {
  for (const st of STATUS_STYLE) {
    const calls = [];
    const rec = new Proxy({}, { get: (_, name) => (...args) => calls.push([name, ...args]) });
    traceShape(rec, st.shape, 10, 10, 4);
    assert.ok(calls.length >= 1, st.shape);
    assert.match(shapeSvgPath(st.shape, 7, 7, 4), /^M/);
  }
});

test('shortcut table: unique keys, lookups, labels', () => {
  const seen = new Set();
  for (const s of SHORTCUTS) for (const k of s.keys) {
    assert.ok(!seen.has(k), `key ${k} used twice`);
    seen.add(k);
  }
  assert.equal(actionFor('f'), 'fit');
  assert.equal(actionFor('F'), 'fit');
  assert.equal(actionFor('?'), 'help');
  assert.equal(actionFor('q'), null);
  assert.equal(keyLabel('ArrowLeft'), '\u2190');
});
