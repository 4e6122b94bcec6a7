import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  formatBranch, formatCount, formatDelta, formatGap, formatSeconds, formatShare, formatValue,
} from '../../web/js/format.js';

test('values keep six significant digits and drop trailing zeros', () => {
  assert.equal(formatValue(2030), '2030');
  assert.equal(formatValue(716.6812345), '716.681');
  assert.equal(formatValue(171.21417711465256), '171.214');
  assert.equal(formatValue(-3.5), '\u22123.5');
  assert.equal(formatValue(0), '0');
  assert.equal(formatValue(null), '\u2014');
  assert.equal(formatValue(NaN), '\u2014');
  assert.equal(formatValue(1.5e12), '1.5e+12');
  assert.equal(formatValue(Infinity), '+\u221e');
});

test('gaps are percentages', () => {
  assert.equal(formatGap(0.647), '64.7%');
  assert.equal(formatGap(0.0123), '1.23%');
  assert.equal(formatGap(0), '0%');
  assert.equal(formatGap(0.00001), '<0.01%');
  assert.equal(formatGap(null), '\u2014');
  assert.equal(formatGap(2.5), '250%');
});

test('counts, seconds, shares, deltas, branches', () => {
  assert.equal(formatCount(1234567), '1,234,567');
  assert.equal(formatCount(12), '12');
  assert.equal(formatSeconds(0.41), '0.41 s');
  assert.equal(formatSeconds(12.34), '12.3 s');
  assert.equal(formatSeconds(245), '4 min 05 s');
  assert.equal(formatSeconds(3720), '1 h 02 min');
  assert.equal(formatSeconds(0.0042), '4.2 ms');
  assert.equal(formatShare(1, 1000), '<1%');
  assert.equal(formatShare(500, 1000), '50%');
  assert.equal(formatShare(1, 0), '\u2014');
  assert.equal(formatDelta(1.25), '+1.25');
  assert.equal(formatDelta(-0.5), '\u22120.5');
  assert.equal(formatBranch('open[3]', 'down', 0), 'open[3] \u2264 0');
  assert.equal(formatBranch('open[3]', 'up', 1), 'open[3] \u2265 1');
});
