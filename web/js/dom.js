// The one module that holds the page's DOM selectors, plus two tiny helpers
// to find and build elements.

export const SEL = Object.freeze({
  libraryPage: '#library-page',
  inspectorPage: '#inspector-page',
  runTitle: '#run-title',
  helpButton: '#help-button',
  helpOverlay: '#help-overlay',
  helpClose: '#help-close',
  helpKeys: '#help-keys',
  helpLegend: '#help-legend',
  // library
  runsBody: '#runs-body',
  runsNote: '#runs-note',
  solveForm: '#solve-form',
  solveModel: '#solve-model',
  solveRule: '#solve-rule',
  solveOrder: '#solve-order',
  solveNodeLimit: '#solve-node-limit',
  solveTimeLimit: '#solve-time-limit',
  solveGap: '#solve-gap',
  solveSeed: '#solve-seed',
  solveError: '#solve-error',
  uploadForm: '#upload-form',
  uploadFile: '#upload-file',
  uploadKind: 'input[name="upload-kind"]',
  uploadResult: '#upload-result',
  comparePicked: '#compare-picked',
  groupForm: '#group-form',
  groupModel: '#group-model',
  groupRules: '#group-rules',
  groupOrders: '#group-orders',
  groupSeeds: '#group-seeds',
  groupNodeLimit: '#group-node-limit',
  groupTimeLimit: '#group-time-limit',
  groupCount: '#group-count',
  groupError: '#group-error',
  groupsList: '#groups-list',
  // comparison page (compare.js)
  comparePage: '#compare-page',
  compareProgress: '#compare-progress',
  compareFit: '#compare-fit',
  compareCancel: '#compare-cancel',
  compareNote: '#compare-note',
  comparePanes: '#compare-panes',
  compareChart: '#compare-chart',
  compareChartNote: '#compare-chart-note',
  compareTable: '#compare-table',
  compareVars: '#compare-vars',
  compareOverlap: '#compare-overlap',
  // inspector
  runFigures: '#run-figures',
  liveBar: '#live-bar',
  liveText: '#live-text',
  liveCancel: '#live-cancel',
  layoutButtons: '[data-layout]',
  fitButton: '#fit-button',
  zoomIn: '#zoom-in',
  zoomOut: '#zoom-out',
  findForm: '#find-form',
  findInput: '#find-input',
  findMessage: '#find-message',
  depthMin: '#depth-min',
  depthMax: '#depth-max',
  unfoldAll: '#unfold-all',
  legend: '#legend',
  treeCanvas: '#tree-canvas',
  treeWrap: '#tree-wrap',
  treeStatus: '#tree-status',
  hoverCard: '#hover-card',
  nodePanel: '#node-panel',
  tabs: '[role="tab"]',
  tabPanels: '[role="tabpanel"]',
  axisButtons: '[data-axis]',
  axisTools: '#axis-tools',
  boundsChart: '#bounds-chart',
  boundsNote: '#bounds-note',
  statusChart: '#status-chart',
  depthChart: '#depth-chart',
  branchTable: '#branch-table',
  branchNote: '#branch-note',
  findingsPanel: '#findings-panel',
  findingsCount: '#findings-count',
  liveForecast: '#live-forecast',
  exportReport: '#export-report',
  exportStatus: '#export-status',
  // walkthrough (walkthrough.js, notespanel.js)
  walkToggle: '#walk-toggle',
  walkBar: '#walk-bar',
  walkFirst: '#walk-first',
  walkPrev: '#walk-prev',
  walkPlay: '#walk-play',
  walkNext: '#walk-next',
  walkLast: '#walk-last',
  walkCounter: '#walk-counter',
  walkSpeed: '#walk-speed',
  walkJumps: '#walk-bar [data-jump]',
  walkMessage: '#walk-message',
  walkTimeline: '#walk-timeline',
  walkTicks: '#walk-ticks',
  walkDone: '#walk-done',
  walkCursor: '#walk-cursor',
  nodeSection: '#node-section',
  walkSide: '#walk-side',
  walkNarration: '#walk-narration',
  notesPanel: '#notes-panel',
  notesCount: '#notes-count',
});

const cache = new Map();

/** The element for a selector key (cached; the page's skeleton never changes). */
export function $(key) {
  let node = cache.get(key);
  if (!node || !node.isConnected) {
    node = document.querySelector(SEL[key]);
    cache.set(key, node);
  }
  return node;
}

export function $all(key) {
  return Array.from(document.querySelectorAll(SEL[key]));
}

/** Build an element: el('td', {class: 'num', title: 'x'}, 'text', child, ...). */
export function el(tag, attrs = {}, ...children) {
  const node = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs ?? {})) {
    if (v === null || v === undefined || v === false) continue;
    if (k === 'class') node.className = v;
    else if (k === 'text') node.textContent = v;
    else if (k.startsWith('on') && typeof v === 'function') node.addEventListener(k.slice(2), v);
    else if (k === 'dataset') Object.assign(node.dataset, v);
    else node.setAttribute(k, v === true ? '' : String(v));
  }
  for (const c of children.flat()) {
    if (c === null || c === undefined || c === false) continue;
    node.append(c instanceof Node ? c : document.createTextNode(String(c)));
  }
  return node;
}

/** An inline SVG marker of a status shape (legends, panels). */
export function shapeIcon(pathD, colour, size = 14, label = null) {
  const ns = 'http://www.w3.org/2000/svg';
  const svg = document.createElementNS(ns, 'svg');
  svg.setAttribute('width', size);
  svg.setAttribute('height', size);
  svg.setAttribute('viewBox', `0 0 ${size} ${size}`);
  if (label) {
    svg.setAttribute('role', 'img');
    svg.setAttribute('aria-label', label);
  } else svg.setAttribute('aria-hidden', 'true');
  const path = document.createElementNS(ns, 'path');
  path.setAttribute('d', pathD);
  path.setAttribute('fill', colour);
  path.setAttribute('fill-rule', 'evenodd');
  svg.append(path);
  return svg;
}
