// Entry point: routes between the run library and the inspector from the URL
// fragment, and keeps the fragment in step with what the inspector shows.

import { ComparePage } from './compare.js';
import { $ } from './dom.js';
import { toggleHelp } from './help.js';
import { formatHash, parseHash } from './hashstate.js';
import { Inspector } from './inspector.js';
import { LibraryPage } from './library.js';
import { showTitle } from './runstrip.js';

let state = parseHash(location.hash);
let inspector = null;
let compare = null;
const library = new LibraryPage({
  openRun: (id, opts) => openRun(id, opts),
  openCompare: (partial) => openCompare(partial),
});

function writeHash(partial, { push = false } = {}) {
  state = { ...state, ...partial };
  const hash = formatHash(state);
  if (hash === location.hash || (hash === '#' && !location.hash)) return;
  if (push) history.pushState(null, '', hash);
  else history.replaceState(null, '', hash);
}

function openRun(id, opts = {}) {
  state = { ...parseHash(''), run: id };
  history.pushState(null, '', formatHash(state));
  route(opts);
}

/** The comparison page: {compare: [ids]} (runs from the library) or {group: id}. */
function openCompare(partial) {
  state = { ...parseHash(''), ...partial };
  history.pushState(null, '', formatHash(state));
  route();
}

function route(opts = {}) {
  const showInspector = Boolean(state.run);
  const showCompare = !showInspector && Boolean(state.compare?.length || state.group);
  $('libraryPage').hidden = showInspector || showCompare;
  $('inspectorPage').hidden = !showInspector;
  $('comparePage').hidden = !showCompare;
  if (!showCompare) compare?.close();
  if (showCompare) {
    inspector?.close();
    if (!compare) {
      compare = new ComparePage({ onState: (partial) => writeHash(partial), openRun });
      window.undergrowth.compare = compare;
    }
    compare.open(state);
  } else if (showInspector) {
    if (!inspector) {
      inspector = new Inspector({ onState: (partial) => writeHash(partial) });
      window.undergrowth.inspector = inspector;
      window.undergrowth.walkthrough = inspector.walk;
    }
    inspector.open(state.run, state, opts);
  } else {
    inspector?.close();
    showTitle(null);
    library.show();
  }
}

window.addEventListener('hashchange', () => {
  state = parseHash(location.hash);
  route();
});
window.addEventListener('popstate', () => {
  state = parseHash(location.hash);
  route();
});
$('helpButton').addEventListener('click', toggleHelp);
document.addEventListener('keydown', (e) => {
  if (e.key === '?' && !$('libraryPage').hidden && !['INPUT', 'SELECT'].includes(e.target.tagName)) toggleHelp();
  if (e.key === 'Escape' && !$('libraryPage').hidden && !$('helpOverlay').hidden) toggleHelp();
});

// A handle for tests and benchmarks (read-only use).
window.undergrowth = { inspector: null, walkthrough: null, compare: null, library, state: () => state };
route();
