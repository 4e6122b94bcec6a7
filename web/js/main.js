// Entry point: routes between the run library and the inspector from the URL
// fragment, and keeps the fragment in step with what the inspector shows.

import { $ } from './dom.js';
import { toggleHelp } from './help.js';
import { formatHash, parseHash } from './hashstate.js';
import { Inspector } from './inspector.js';
import { LibraryPage } from './library.js';
import { showTitle } from './runstrip.js';

let state = parseHash(location.hash);
let inspector = null;
const library = new LibraryPage({ openRun: (id, opts) => openRun(id, opts) });

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

function route(opts = {}) {
  const showInspector = Boolean(state.run);
  $('libraryPage').hidden = showInspector;
  $('inspectorPage').hidden = !showInspector;
  if (showInspector) {
    if (!inspector) {
      inspector = new Inspector({ onState: (partial) => writeHash(partial) });
      window.undergrowth.inspector = inspector;
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
window.undergrowth = { inspector: null, library, state: () => state };
route();
