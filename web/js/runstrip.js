// The strip of key figures above the tree, and the page title.

import { $, el } from './dom.js';
import { formatCount, formatGap, formatSeconds, formatValue } from './format.js';

/** figures: {model, branching, select, nodes, status, objective, dual, gap, seconds, sense} */
export function showFigures(f) {
  const item = (label, value, field) => el('div', {}, el('dt', {}, label),
    el('dd', field ? { 'data-field': field } : {}, value));
  $('runFigures').replaceChildren(
    item('Rule \u00b7 order', `${f.branching ?? '\u2014'} \u00b7 ${f.select ?? '\u2014'}`),
    item('Nodes', formatCount(f.nodes), 'nodes'),
    item('Result', f.status ?? '\u2014', 'status'),
    item(`Best solution (${f.sense === 'max' ? 'max' : 'min'})`, formatValue(f.objective), 'objective'),
    item('Best bound', formatValue(f.dual), 'dual'),
    item('Gap', formatGap(f.gap), 'gap'),
    item('Time', formatSeconds(f.seconds)),
  );
}

export function showTitle(runId, figures) {
  const title = $('runTitle');
  if (!runId) {
    title.replaceChildren();
    return;
  }
  const model = figures?.model ?? runId;
  title.replaceChildren(el('span', {}, model), el('span', { class: 'sub' }, runId));
  document.title = `Undergrowth \u2014 ${model}`;
}

/** Figures from GET /api/runs/{id}. */
export function figuresFromDetail(d) {
  const h = d.header ?? {};
  const s = d.summary ?? {};
  return {
    model: h.model?.name ?? d.job?.model ?? d.id,
    branching: h.settings?.branching ?? d.job?.settings?.branching,
    select: h.settings?.select ?? d.job?.settings?.select,
    nodes: s.nodes ?? d.job?.nodes ?? 0,
    status: d.status ?? s.end_status,
    objective: s.objective ?? d.job?.objective ?? null,
    dual: s.dual_bound ?? d.job?.dual_bound ?? null,
    gap: s.gap ?? d.job?.gap ?? null,
    seconds: s.seconds ?? null,
    sense: s.sense ?? h.model?.sense ?? 'min',
  };
}
