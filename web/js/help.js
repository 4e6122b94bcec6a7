// The help overlay: keyboard shortcuts (from keys.js) and the status legend.

import { $, el } from './dom.js';
import { keyLabel, SHORTCUTS } from './keys.js';
import { fillHelpLegend } from './legend.js';

let filled = false;
let opener = null;

export function isHelpOpen() {
  return !$('helpOverlay').hidden;
}

export function openHelp() {
  const overlay = $('helpOverlay');
  if (!filled) {
    $('helpKeys').replaceChildren(el('tbody', {}, SHORTCUTS.map((s) => el('tr', {},
      el('td', {}, s.keys.map((k) => el('kbd', {}, keyLabel(k)))),
      el('td', {}, s.help)))));
    fillHelpLegend($('helpLegend'));
    overlay.addEventListener('click', (e) => { if (e.target === overlay) closeHelp(); });
    $('helpClose').addEventListener('click', closeHelp);
    filled = true;
  }
  opener = document.activeElement;
  overlay.hidden = false;
  $('helpClose').focus();
}

export function closeHelp() {
  $('helpOverlay').hidden = true;
  if (opener && opener.focus) opener.focus();
}

export function toggleHelp() {
  if (isHelpOpen()) closeHelp();
  else openHelp();
}
