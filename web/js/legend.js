// The status legend above the tree. Each entry is a toggle button: pressing it
// hides or shows that status (the status filter). Also used, read-only, in
// the help overlay.

import { el, shapeIcon } from './dom.js';
import { formatCount } from './format.js';
import { shapeSvgPath } from './shapes.js';
import { INCUMBENT_COLOUR, STATUS_NAMES, STATUS_STYLE } from './statuses.js';

export function statusIcon(code, size = 14, label = null) {
  const st = STATUS_STYLE[code];
  return shapeIcon(shapeSvgPath(st.shape, size / 2, size / 2, size * 0.3), st.colour, size, label);
}

/** Build the legend in `container`; onToggle(code, shown) is called on a press. */
export function buildLegend(container, onToggle) {
  container.replaceChildren();
  const buttons = STATUS_NAMES.map((name, code) => {
    const count = el('span', { class: 'count' }, '');
    const b = el('button', {
      type: 'button', 'aria-pressed': 'true', dataset: { status: name },
      title: `${STATUS_STYLE[code].hint}. Click to hide or show.`,
    }, statusIcon(code), el('span', {}, name), count);
    b.addEventListener('click', () => {
      const shown = b.getAttribute('aria-pressed') !== 'true';
      b.setAttribute('aria-pressed', String(shown));
      onToggle(code, shown);
    });
    container.append(b);
    return { b, count };
  });
  const ringSvg = shapeIcon('M7 1.5a5.5 5.5 0 1 1 0 11a5.5 5.5 0 1 1 0-11zM7 3.5a3.5 3.5 0 1 0 0 7a3.5 3.5 0 1 0 0-7z',
    INCUMBENT_COLOUR, 14);
  const ring = el('span', { class: 'legend-extra', title: 'A node whose solution became an incumbent' },
    ringSvg, 'incumbent found');
  const bar = el('span', { class: 'legend-extra',
    title: 'A subtree narrower than a pixel, coloured by the status closing most of its nodes' },
  el('span', { style: 'display:inline-block;width:2px;height:13px;background:#888', 'aria-hidden': 'true' }),
  'subtree < 1 px');
  container.append(ring, bar);
  return {
    /** Show counts per status code (Uint32Array or array). */
    setCounts(counts) {
      buttons.forEach(({ b, count }, code) => {
        count.textContent = formatCount(counts[code] ?? 0);
        // Statuses the run does not have stay out of the way (the help lists them all).
        b.hidden = !counts[code] && b.getAttribute('aria-pressed') === 'true';
      });
    },
    reset() {
      for (const { b } of buttons) b.setAttribute('aria-pressed', 'true');
    },
  };
}

/** The read-only legend for the help overlay. */
export function fillHelpLegend(list) {
  list.replaceChildren(...STATUS_NAMES.map((name, code) => el('li', {},
    statusIcon(code, 16), el('strong', {}, name), el('span', { class: 'muted' }, STATUS_STYLE[code].hint))));
}
