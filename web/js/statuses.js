// Node statuses: codes (as stored in the tree arrays), colours, marker shapes
// and plain-language reasons. Pure data, no DOM.
//
// Colours are the Okabe–Ito palette (safe for the common colour-vision
// deficiencies); every status also has its own marker shape, so colour is
// never the only cue.

export const STATUS_NAMES = Object.freeze([
  'branched', 'integral', 'pruned', 'infeasible', 'discarded', 'open', 'failed',
]);

export const STATUS_CODE = Object.freeze(
  Object.fromEntries(STATUS_NAMES.map((name, code) => [name, code])),
);

export const STATUS_COUNT = STATUS_NAMES.length;
export const BRANCHED = 0;
export const INTEGRAL = 1;
export const PRUNED = 2;
export const INFEASIBLE = 3;
export const DISCARDED = 4;
export const OPEN = 5;
export const FAILED = 6;

// Shape names understood by the tree renderer and the legend.
export const STATUS_STYLE = Object.freeze([
  { colour: '#0072B2', shape: 'dot', label: 'branched', hint: 'split into two children' },
  { colour: '#009E73', shape: 'diamond', label: 'integral', hint: 'integer solution found here' },
  { colour: '#E69F00', shape: 'triangle-down', label: 'pruned', hint: 'bound no better than the incumbent' },
  { colour: '#D55E00', shape: 'cross', label: 'infeasible', hint: 'relaxation has no solution' },
  { colour: '#CC79A7', shape: 'square', label: 'discarded', hint: 'dropped unsolved after a better incumbent' },
  { colour: '#56B4E9', shape: 'triangle-up', label: 'open', hint: 'still waiting when the search stopped' },
  { colour: '#000000', shape: 'plus', label: 'failed', hint: 'relaxation solver gave no answer' },
]);

export const INCUMBENT_COLOUR = '#009E73';
export const EDGE_COLOUR = 'rgba(60, 64, 72, 0.45)';
export const PATH_COLOUR = '#1b1f24';

export function statusName(code) {
  return STATUS_NAMES[code] ?? 'unknown';
}

export function statusColour(code) {
  return (STATUS_STYLE[code] ?? STATUS_STYLE[FAILED]).colour;
}

// A bit mask with every status allowed.
export const ALL_STATUSES = (1 << STATUS_COUNT) - 1;

/**
 * A sentence that says why a node ended as it did, for the node panel.
 * `node` is the server's node record (bound, status, message, lp, ...);
 * `ctx` holds the run's sense and the incumbent known when it was closed.
 */
export function statusReason(node, ctx = {}) {
  const sense = ctx.sense === 'max' ? 'max' : 'min';
  const better = sense === 'min' ? 'lower' : 'higher';
  const inc = ctx.incumbent;
  const fmt = ctx.format ?? ((v) => String(v));
  switch (node.status) {
    case 'branched': {
      const b = node.branching;
      const what = b ? `${b.name ?? `x${b.var}`} = ${fmt(b.value)}` : 'a fractional integer variable';
      return `The relaxation was solved but ${node.fractional ?? 'some'} integer variable(s) ` +
        `were fractional, so the search split on ${what} into a down and an up child.`;
    }
    case 'integral':
      return 'The relaxation solution already satisfies every integrality requirement, ' +
        'so this node needs no children; its value was offered as an incumbent.';
    case 'pruned': {
      const against = Number.isFinite(inc) ? ` (${fmt(inc)})` : '';
      return `The relaxation bound ${fmt(node.bound)} is not ${better} than the incumbent` +
        `${against}, so nothing below this node can improve the best solution: it was closed.`;
    }
    case 'infeasible':
      return 'The relaxation with this node\u2019s bound changes has no feasible point, ' +
        'so no integer solution exists below it.';
    case 'discarded':
      return 'This node was never solved: a better incumbent arrived while it waited, and its ' +
        'inherited bound showed it could not beat that incumbent.';
    case 'open':
      return 'This node was still waiting to be solved when the search stopped ' +
        '(a limit was reached or the solve was cancelled).';
    case 'failed':
      return `The relaxation solver gave no usable answer${node.message ? `: ${node.message}` : '.'} ` +
        'Its region still counts towards the dual bound.';
    default:
      return '';
  }
}
