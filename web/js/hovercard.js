// The hover card over the tree: a few facts about the node or subtree under
// the pointer, built from the tree arrays only (no request).

import { el } from './dom.js';
import { formatBranch, formatCount, formatShare, formatValue } from './format.js';
import { statusIcon } from './legend.js';
import { MARK_BAR, MARK_FOLDED } from './lod.js';
import { STATUS_COUNT, STATUS_NAMES } from './statuses.js';
import { AGG_STRIDE } from './tidy.js';

export function fillHoverCard(card, hit, store, scene, px, py, wrapRect) {
  if (!hit) {
    card.hidden = true;
    return;
  }
  const r = hit.row;
  const st = store.status[r];
  const id = store.id[r];
  const rows = [];
  let title;
  if (hit.kind === MARK_BAR || hit.kind === MARK_FOLDED) {
    const size = store.size[r];
    title = `Subtree of node ${id}: ${formatCount(size)} nodes`;
    const base = r * AGG_STRIDE;
    const parts = [];
    for (let s = 0; s < STATUS_COUNT; s++) {
      const c = scene.counts[base + s];
      if (c) parts.push([c, s]);
    }
    parts.sort((a, b) => b[0] - a[0]);
    for (const [c, s] of parts.slice(0, 4)) rows.push([STATUS_NAMES[s], `${formatCount(c)} (${formatShare(c, size)})`]);
    rows.push(['', hit.kind === MARK_FOLDED ? 'folded: press C to unfold' : 'double-click to zoom in']);
  } else {
    title = `Node ${id} \u00b7 ${STATUS_NAMES[st]}`;
    rows.push(['bound', formatValue(store.bound[r])]);
    rows.push(['depth', formatCount(store.depth[r])]);
    if (store.order[r] >= 0) rows.push(['processed', `#${formatCount(store.order[r])}`]);
    if (store.var[r] >= 0) {
      const name = store.varNames?.[store.var[r]] ?? `x${store.var[r]}`;
      rows.push(['change', formatBranch(name, store.dir[r] === 2 ? 'up' : 'down', store.value[r])]);
    }
    if (store.size[r] > 1) rows.push(['subtree', `${formatCount(store.size[r])} nodes`]);
  }
  card.replaceChildren(
    el('div', { class: 'hc-title' }, statusIcon(hit.kind === MARK_BAR ? hit.status : st, 14), title),
    el('dl', {}, rows.flatMap(([k, v]) => [el('dt', {}, k), el('dd', {}, v)])));
  card.hidden = false;
  const w = card.offsetWidth;
  const h = card.offsetHeight;
  let x = px + 14;
  let y = py + 14;
  if (x + w > wrapRect.width - 4) x = px - w - 14;
  if (y + h > wrapRect.height - 4) y = py - h - 14;
  card.style.left = `${Math.max(4, x)}px`;
  card.style.top = `${Math.max(4, y)}px`;
}
