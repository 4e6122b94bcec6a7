// The page state kept in the URL fragment, so a link can be shared in a review:
//   #run=<id>&node=<id>&layout=depth|bound&view=x0,x1,y0,y1&tab=bounds|closed|branching&axis=nodes|time
// No run means the library page. Pure, no DOM.

export const LAYOUTS = ['depth', 'bound'];
export const TABS = ['bounds', 'closed', 'branching'];
export const AXES = ['nodes', 'time'];

const DEFAULTS = { run: null, node: null, layout: 'depth', view: null, tab: 'bounds', axis: 'nodes' };

export function parseHash(hash) {
  const text = String(hash ?? '').replace(/^#/, '');
  const params = new URLSearchParams(text);
  const state = { ...DEFAULTS };
  const run = params.get('run');
  if (run) state.run = run;
  const node = params.get('node');
  if (node !== null && /^-?\d+$/.test(node)) state.node = Number(node);
  const layout = params.get('layout');
  if (LAYOUTS.includes(layout)) state.layout = layout;
  const view = params.get('view');
  if (view) state.view = view;
  const tab = params.get('tab');
  if (TABS.includes(tab)) state.tab = tab;
  const axis = params.get('axis');
  if (AXES.includes(axis)) state.axis = axis;
  return state;
}

/** The fragment for `state`, leaving out values at their defaults (except run). */
export function formatHash(state) {
  const parts = [];
  if (state.run) parts.push(`run=${encodeURIComponent(state.run)}`);
  if (state.node !== null && state.node !== undefined) parts.push(`node=${state.node}`);
  if (state.layout && state.layout !== DEFAULTS.layout) parts.push(`layout=${state.layout}`);
  if (state.view) parts.push(`view=${state.view}`);
  if (state.tab && state.tab !== DEFAULTS.tab) parts.push(`tab=${state.tab}`);
  if (state.axis && state.axis !== DEFAULTS.axis) parts.push(`axis=${state.axis}`);
  return parts.length ? `#${parts.join('&')}` : '#';
}
