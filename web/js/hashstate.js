// The page state kept in the URL fragment, so a link can be shared in a review:
//   #run=<id>&node=<id>&layout=depth|bound&view=x0,x1,y0,y1&tab=bounds|closed|branching|findings&axis=nodes|time
//   #run=<id>&step=<k>  (the walkthrough at step k, 0-based; the page shows "step k+1 of N")
//   #compare=<id>,<id>,...&axis=...  (runs side by side)  or  #group=<id>  (a comparison group)
// No run, comparison or group means the library page. Pure, no DOM.

export const LAYOUTS = ['depth', 'bound'];
export const TABS = ['bounds', 'closed', 'branching', 'findings'];
export const AXES = ['nodes', 'time'];

const DEFAULTS = { run: null, node: null, step: null, layout: 'depth', view: null, tab: 'bounds', axis: 'nodes',
  compare: null, group: null };

export function parseHash(hash) {
  const text = String(hash ?? '').replace(/^#/, '');
  const params = new URLSearchParams(text);
  const state = { ...DEFAULTS };
  const run = params.get('run');
  if (run) state.run = run;
  const node = params.get('node');
  if (node !== null && /^-?\d+$/.test(node)) state.node = Number(node);
  const step = params.get('step');
  if (step !== null && /^\d+$/.test(step)) state.step = Number(step);
  const layout = params.get('layout');
  if (LAYOUTS.includes(layout)) state.layout = layout;
  const view = params.get('view');
  if (view) state.view = view;
  const tab = params.get('tab');
  if (TABS.includes(tab)) state.tab = tab;
  const axis = params.get('axis');
  if (AXES.includes(axis)) state.axis = axis;
  const compare = params.get('compare'); // run ids never hold a comma (docs/api.md: ids)
  if (compare) {
    const ids = Array.from(new Set(compare.split(',').filter(Boolean)));
    if (ids.length) state.compare = ids;
  }
  const group = params.get('group');
  if (group) state.group = group;
  return state;
}

/** The fragment for `state`, leaving out values at their defaults (except run). */
export function formatHash(state) {
  const parts = [];
  if (state.run) parts.push(`run=${encodeURIComponent(state.run)}`);
  if (state.node !== null && state.node !== undefined) parts.push(`node=${state.node}`);
  if (state.step !== null && state.step !== undefined) parts.push(`step=${state.step}`);
  if (state.layout && state.layout !== DEFAULTS.layout) parts.push(`layout=${state.layout}`);
  if (state.view) parts.push(`view=${state.view}`);
  if (state.tab && state.tab !== DEFAULTS.tab) parts.push(`tab=${state.tab}`);
  if (state.compare?.length) parts.push(`compare=${state.compare.map(encodeURIComponent).join(',')}`);
  if (state.group) parts.push(`group=${encodeURIComponent(state.group)}`);
  if (state.axis && state.axis !== DEFAULTS.axis) parts.push(`axis=${state.axis}`);
  return parts.length ? `#${parts.join('&')}` : '#';
}
