// Keyboard shortcuts of the inspector: one table feeds the key handler and the
// help overlay (and docs/web.md lists the same). Pure, no DOM.

export const SHORTCUTS = Object.freeze([
  { keys: ['f'], action: 'fit', help: 'Fit the whole tree in view' },
  { keys: ['+', '='], action: 'zoom-in', help: 'Zoom in (wider)' },
  { keys: ['-', '_'], action: 'zoom-out', help: 'Zoom out (narrower)' },
  { keys: ['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown'], action: 'pan', help: 'Pan the tree' },
  { keys: ['l'], action: 'toggle-layout', help: 'Switch between depth and bound layout' },
  { keys: ['p'], action: 'parent', help: 'Select the parent of the selected node' },
  { keys: ['d'], action: 'down-child', help: 'Select the down child' },
  { keys: ['u'], action: 'up-child', help: 'Select the up child' },
  { keys: ['r'], action: 'root', help: 'Select the root' },
  { keys: ['i'], action: 'incumbent', help: 'Select the node of the best incumbent' },
  { keys: ['z'], action: 'zoom-subtree', help: 'Zoom to the selected node\u2019s subtree' },
  { keys: ['c'], action: 'fold', help: 'Fold or unfold the selected subtree' },
  { keys: ['/'], action: 'find', help: 'Find a node by id' },
  { keys: ['1'], action: 'tab-bounds', help: 'Show the bounds chart' },
  { keys: ['2'], action: 'tab-closed', help: 'Show why nodes closed' },
  { keys: ['3'], action: 'tab-branching', help: 'Show the branching variables' },
  { keys: ['4'], action: 'tab-findings', help: 'Show the findings and the forecast' },
  { keys: ['t'], action: 'toggle-axis', help: 'Bounds chart: nodes or seconds on the x axis' },
  { keys: ['w'], action: 'walk-toggle', help: 'Walkthrough on or off (step through the search)' },
  { keys: ['.'], action: 'walk-next', help: 'Walkthrough: next step' },
  { keys: [','], action: 'walk-prev', help: 'Walkthrough: previous step' },
  { keys: ['Home'], action: 'walk-first', help: 'Walkthrough: first step' },
  { keys: ['End'], action: 'walk-last', help: 'Walkthrough: last step' },
  { keys: ['s'], action: 'walk-play', help: 'Walkthrough: play or pause' },
  { keys: [']'], action: 'walk-faster', help: 'Walkthrough: play faster' },
  { keys: ['['], action: 'walk-slower', help: 'Walkthrough: play slower' },
  { keys: ['n'], action: 'walk-incumbent', help: 'Walkthrough: next new incumbent' },
  { keys: ['N'], action: 'walk-incumbent-back', help: 'Walkthrough: previous new incumbent' },
  { keys: ['x'], action: 'walk-prune', help: 'Walkthrough: next pruned node' },
  { keys: ['X'], action: 'walk-prune-back', help: 'Walkthrough: previous pruned node' },
  { keys: ['g'], action: 'walk-finding', help: 'Walkthrough: next step a finding points at' },
  { keys: ['G'], action: 'walk-finding-back', help: 'Walkthrough: previous step a finding points at' },
  { keys: ['Escape'], action: 'clear', help: 'Clear the selection / close this help' },
  { keys: ['?'], action: 'help', help: 'Show or hide this help' },
]);

const BY_KEY = new Map();
for (const s of SHORTCUTS) for (const k of s.keys) BY_KEY.set(k, s.action);

/** The action for a key name (KeyboardEvent.key), or null. */
export function actionFor(key) {
  return BY_KEY.get(key) ?? BY_KEY.get(String(key).toLowerCase()) ?? null;
}

/** Human-readable key names: "ArrowLeft" -> "←". */
export function keyLabel(key) {
  return { ArrowLeft: '\u2190', ArrowRight: '\u2192', ArrowUp: '\u2191', ArrowDown: '\u2193',
    Escape: 'Esc' }[key] ?? key;
}
