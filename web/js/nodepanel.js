// The node panel: what the tree arrays say about the selected node at once,
// then the server's full record (GET /api/runs/{id}/nodes/{node}): the path
// from the root with each bound change, the relaxation, the branching
// decision, and why the node ended as it did.

import { el } from './dom.js';
import { formatBranch, formatCount, formatSeconds, formatValue } from './format.js';
import { statusIcon } from './legend.js';
import { STATUS_CODE, STATUS_NAMES, statusReason } from './statuses.js';

export class NodePanel {
  /** root: the panel element; hooks: {onSelectId(id), onAction(name)} */
  constructor(root, hooks = {}) {
    this.root = root;
    this.hooks = hooks;
  }

  clear() {
    this.root.replaceChildren(el('p', { class: 'muted' },
      'Click a node in the tree to see how the search reached it and why it closed.'));
    this.root.removeAttribute('data-node');
  }

  /** Immediate facts from the arrays while the full record loads. */
  showQuick(store, row) {
    const code = store.status[row];
    const id = store.id[row];
    this.root.dataset.node = String(id);
    this.root.replaceChildren(
      this._head(id, code),
      facts([
        ['Bound', formatValue(store.bound[row]), 'bound'],
        ['Depth', formatCount(store.depth[row])],
        ['Processed', store.order[row] >= 0 ? `#${formatCount(store.order[row])}` : 'never'],
      ]),
      this._actions(store, row),
      el('p', { class: 'muted small' }, 'Loading the node\u2019s details\u2026'),
    );
  }

  /** The server's record. */
  showDetail(store, row, detail) {
    const node = detail.node ?? {};
    const code = STATUS_CODE[detail.status ?? node.status] ?? store.status[row];
    const lp = node.lp;
    const b = node.branching;
    const inc = detail.incumbent;
    const reason = detail.reason || statusReason(node, { sense: store.sense,
      incumbent: inc?.objective, format: formatValue });
    this.root.dataset.node = String(node.id);
    const sections = [
      this._head(node.id, code),
      el('p', { class: 'reason' }, reason),
      facts([
        ['Bound', formatValue(node.bound), 'bound'],
        ['Depth', formatCount(node.depth)],
        ['Processed', node.order !== null && node.order !== undefined ? `#${formatCount(node.order)} at ${formatSeconds(node.time)}` : 'never'],
        ['Relaxation', lp ? `${lp.status}${lp.objective !== null ? `, value ${formatValue(lp.objective)}` : ''}` : 'not solved'],
        lp ? ['Iterations', `${formatCount(lp.iterations)}${lp.seconds !== null ? ` in ${formatSeconds(lp.seconds)}` : ''}`] : null,
        ['Fractional', node.lp ? `${formatCount(node.fractional)} integer variable(s)` : '\u2014'],
        inc ? ['Incumbent then', `${formatValue(inc.objective)}${inc.node !== null && inc.node !== undefined ? ` (node ${inc.node})` : ''}`] : null,
        detail.found_incumbent ? ['Found here', `new incumbent ${formatValue(detail.found_incumbent.objective)} (${detail.found_incumbent.source})`] : null,
      ]),
    ];
    if (b) {
      const lookahead = b.down_bound !== null || b.up_bound !== null;
      sections.push(el('h3', {}, 'Branching decision'), facts([
        ['Variable', `${b.name} = ${formatValue(b.value)}`],
        ['Rule', b.rule ?? '\u2014'],
        ['Score', formatValue(b.score)],
        b.runner_up ? ['Runner-up', `${b.runner_up.name} (score ${formatValue(b.runner_up.score)})`] : null,
        lookahead ? ['Child bounds seen', `down ${formatValue(b.down_bound)} \u00b7 up ${formatValue(b.up_bound)}`] : null,
      ]));
    }
    if (detail.children?.length) {
      sections.push(el('h3', {}, 'Children'), el('div', { class: 'actions' },
        detail.children.map((cid) => {
          const r = store.rowOf(cid);
          const st = r >= 0 ? store.status[r] : 0;
          return el('button', { type: 'button', class: 'small', onclick: () => this.hooks.onSelectId?.(cid),
            'aria-label': `Select child node ${cid} (${STATUS_NAMES[st]})` },
          statusIcon(st, 12), ` node ${cid}`);
        })));
    }
    sections.push(this._actions(store, row));
    if (detail.path?.length) {
      sections.push(el('h3', {}, `Path from the root (${detail.path.length - 1} bound change${detail.path.length === 2 ? '' : 's'})`),
        el('ol', { class: 'path' }, detail.path.map((step) => {
          const st = STATUS_CODE[step.status] ?? 0;
          const label = step.branch ? formatBranch(step.branch.name, step.branch.dir, step.branch.value)
            : 'root';
          return el('li', { class: step.id === node.id ? 'current' : null },
            statusIcon(st, 14),
            el('button', { type: 'button', onclick: () => this.hooks.onSelectId?.(step.id),
              'aria-label': `Select node ${step.id}: ${label}` }, `${step.id}: ${label}`),
            el('span', { class: 'pb', title: 'bound' }, formatValue(step.bound)));
        })));
    }
    this.root.replaceChildren(...sections.filter(Boolean));
  }

  showError(store, row, err) {
    this.root.append(el('p', { class: 'error', role: 'alert' },
      `The node\u2019s details could not be loaded: ${err.message}`));
  }

  _head(id, code) {
    return el('div', { class: 'node-head' }, statusIcon(code, 18, STATUS_NAMES[code]),
      el('span', { 'data-field': 'id' }, `Node ${id}`),
      el('span', { class: 'badge' }, STATUS_NAMES[code]));
  }

  _actions(store, row) {
    const a = (name, label, title) => el('button', { type: 'button', class: 'small', title,
      onclick: () => this.hooks.onAction?.(name) }, label);
    const leaf = store.size[row] <= 1;
    return el('div', { class: 'actions' },
      store.parent[row] >= 0 ? a('parent', 'Parent (P)', 'Select the parent node') : null,
      leaf ? null : a('zoom-subtree', 'Zoom to subtree (Z)', 'Fit this node\u2019s subtree in view'),
      leaf ? null : a('fold', 'Fold / unfold (C)', 'Draw this subtree as a single mark'));
  }
}

function facts(rows) {
  return el('dl', { class: 'facts' }, rows.filter(Boolean).flatMap(([k, v, field]) => [
    el('dt', {}, k), el('dd', field ? { 'data-field': field } : {}, v)]));
}
