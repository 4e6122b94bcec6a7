// The run library page: the runs with their key figures, uploads of runs and
// models (errors show the line the server names), and starting a solve that
// opens live in the inspector. Runs can be ticked and compared side by side, and
// a comparison of several rules on one model can be started (compare.js shows both).

import { api, ApiError } from './api.js';
import { $, $all, el } from './dom.js';
import { formatCount, formatGap, formatValue } from './format.js';

// The engine's branching rules and node orders (the API has no list of them yet;
// a solve with any other name is refused with a message naming the choices).
const RULES = ['reliability', 'pseudocost', 'strong', 'most-fractional', 'least-fractional',
  'first-index', 'random'];
const ORDERS = ['hybrid', 'best-bound', 'depth-first', 'best-estimate', 'breadth-first'];

const RESULT_BADGE = { optimal: 'good', 'gap-reached': 'good', infeasible: 'warn', unbounded: 'warn',
  'node-limit': 'warn', 'time-limit': 'warn', cancelled: 'warn', incomplete: 'warn', failed: 'warn',
  unreadable: 'warn', running: 'live', queued: 'live' };

const PICK_MIN = 2; // runs compared side by side (compare.js draws up to four trees)
const PICK_MAX = 4;
const GROUP_MAX = 12; // members of one comparison group (the server's limit)
const GROUP_RULES = ['most-fractional', 'pseudocost', 'reliability']; // ticked at first

export class LibraryPage {
  constructor({ openRun, openCompare }) {
    this.openRun = openRun;
    this.openCompare = openCompare;
    this.bound = false;
    this.picked = new Set(); // run ids ticked for a comparison
  }

  async show() {
    if (!this.bound) this._bind();
    document.title = 'Undergrowth \u2014 run library';
    await Promise.all([this.loadRuns(), this.loadSolveOptions(), this.loadGroups()]);
  }

  async loadRuns() {
    const note = $('runsNote');
    try {
      const runs = await api.runs();
      const list = Array.isArray(runs) ? runs : (runs.runs ?? []);
      const known = new Set(list.map((r) => r.id));
      for (const id of this.picked) if (!known.has(id)) this.picked.delete(id);
      this._renderRuns(list);
      this._pickedChanged();
      const samples = list.filter((r) => r.source === 'samples').length;
      note.textContent = `${list.length} runs: ${samples} bundled samples, ${list.length - samples} ` +
        'of your own. Click a run to inspect it.';
    } catch (err) {
      note.textContent = `The runs could not be listed: ${err.message}`;
    }
  }

  _renderRuns(list) {
    const rows = list.map((r) => {
      const open = () => this.openRun(r.id);
      const badge = RESULT_BADGE[r.status] ?? '';
      const when = r.created ? String(r.created).replace('T', ' ').slice(0, 16) : '';
      const pick = el('input', { type: 'checkbox', checked: this.picked.has(r.id),
        'aria-label': `Pick ${r.name ?? r.id} for a comparison` });
      pick.addEventListener('change', () => {
        if (pick.checked) this.picked.add(r.id);
        else this.picked.delete(r.id);
        this._pickedChanged();
      });
      const tr = el('tr', { dataset: { run: r.id } },
        el('td', { class: 'pick' }, pick),
        el('td', {}, el('a', { href: `#run=${encodeURIComponent(r.id)}`,
          'aria-label': `Inspect ${r.name ?? r.id}` }, r.model ?? r.id),
        ' ', el('span', { class: `badge ${r.source === 'samples' ? '' : 'own'}` },
          r.source === 'samples' ? 'sample' : 'yours'),
        r.source === 'samples' ? null : el('div', { class: 'muted small' }, when),
        r.group ? el('a', { class: 'badge group', href: `#group=${encodeURIComponent(r.group)}`,
          title: 'Open the comparison this run belongs to' }, 'comparison') : null,
        r.error ? el('div', { class: 'error small' }, r.error) : null),
        el('td', {}, r.branching ?? '\u2014'),
        el('td', {}, r.select ?? '\u2014'),
        el('td', { class: 'num' }, formatCount(r.nodes)),
        el('td', {}, el('span', { class: `badge ${badge}` }, r.live ? `live \u00b7 ${r.status}` : r.status ?? '\u2014')),
        el('td', { class: 'num' }, formatValue(r.objective)),
        el('td', { class: 'num' }, formatValue(r.dual_bound)),
        el('td', { class: 'num' }, formatGap(r.gap)));
      tr.addEventListener('click', (e) => {
        if (e.target.closest('a, input, td.pick')) return;
        open();
      });
      return tr;
    });
    $('runsBody').replaceChildren(...rows);
  }

  async loadSolveOptions() {
    const modelSel = $('solveModel');
    try {
      const models = await api.models();
      const list = Array.isArray(models) ? models : (models.models ?? []);
      const keep = modelSel.value;
      modelSel.replaceChildren(...list.filter((m) => !m.error).map((m) => el('option', { value: m.id },
        `${m.name ?? m.id}${m.rows !== null && m.rows !== undefined ? ` \u2014 ${m.rows}\u00d7${m.columns}, ${m.integers} integer` : ''}`)));
      if (keep) modelSel.value = keep;
      const groupSel = $('groupModel');
      const keepGroup = groupSel.value;
      groupSel.replaceChildren(...Array.from(modelSel.options, (o) => o.cloneNode(true)));
      if (keepGroup) groupSel.value = keepGroup;
    } catch (err) {
      this._solveError(`The models could not be listed: ${err.message}`);
    }
    if ($('solveRule').options.length) return;
    const rules = RULES;
    const orders = ORDERS;
    $('solveRule').replaceChildren(...rules.map((v) => el('option', { value: v }, v)));
    $('solveOrder').replaceChildren(...orders.map((v) => el('option', { value: v }, v)));
    this._groupChoices();
    $('solveRule').value = rules.includes('reliability') ? 'reliability' : rules[0];
    $('solveOrder').value = orders.includes('hybrid') ? 'hybrid' : orders[0];
  }

  _bind() {
    this.bound = true;
    $('solveForm').addEventListener('submit', (e) => {
      e.preventDefault();
      this._startSolve();
    });
    $('comparePicked').addEventListener('click', () => {
      const ids = Array.from(this.picked);
      if (ids.length >= PICK_MIN && ids.length <= PICK_MAX) this.openCompare({ compare: ids });
    });
    $('groupForm').addEventListener('submit', (e) => {
      e.preventDefault();
      this._startGroup();
    });
    $('groupForm').addEventListener('change', () => this._groupCount());
    $('uploadForm').addEventListener('submit', (e) => {
      e.preventDefault();
      this._upload();
    });
  }

  async _startSolve() {
    const num = (key) => {
      const v = $(key).value.trim();
      return v === '' ? null : Number(v);
    };
    const body = {
      model: $('solveModel').value,
      branching: $('solveRule').value,
      select: $('solveOrder').value,
      node_limit: num('solveNodeLimit'),
      time_limit: num('solveTimeLimit'),
      gap: num('solveGap') ?? 1e-4,
      seed: num('solveSeed') ?? 0,
    };
    const button = $('solveForm').querySelector('button[type="submit"]');
    button.disabled = true;
    $('solveError').hidden = true;
    try {
      const answer = await api.startSolve(body);
      this.openRun(answer.run_id, { live: true });
    } catch (err) {
      this._solveError(describeError(err));
    } finally {
      button.disabled = false;
    }
  }

  // ------------------------------------------------------------ comparisons
  _pickedChanged() {
    const n = this.picked.size;
    const button = $('comparePicked');
    button.disabled = n < PICK_MIN || n > PICK_MAX;
    button.textContent = n ? `Compare ${n} picked` : 'Compare';
    button.title = n > PICK_MAX ? `Pick at most ${PICK_MAX} runs` : `Tick ${PICK_MIN} to ${PICK_MAX} runs in the first column, then compare them side by side`;
  }

  _groupChoices() {
    const boxes = (name, values, ticked) => values.map((v) => el('label', { class: 'cmp-choice' },
      el('input', { type: 'checkbox', name, value: v, checked: ticked.includes(v) }), ` ${v}`));
    $('groupRules').append(...boxes('group-rule', RULES, GROUP_RULES));
    $('groupOrders').append(...boxes('group-order', ORDERS, ['hybrid']));
    this._groupCount();
  }

  _groupPlan() {
    const ticked = (name) => Array.from(document.querySelectorAll(`input[name="${name}"]:checked`), (i) => i.value);
    const seeds = Math.max(1, Math.round(Number($('groupSeeds').value) || 1));
    const branching = ticked('group-rule');
    const select = ticked('group-order');
    return { branching, select, seeds, runs: branching.length * select.length * seeds };
  }

  _groupCount() {
    const plan = this._groupPlan();
    const ok = plan.runs >= 2 && plan.runs <= GROUP_MAX;
    $('groupCount').textContent = `${plan.runs} run${plan.runs === 1 ? '' : 's'}` +
      (ok ? '' : ` (a comparison has 2 to ${GROUP_MAX})`);
    $('groupForm').querySelector('button[type="submit"]').disabled = !ok;
  }

  async _startGroup() {
    const num = (key) => {
      const v = $(key).value.trim();
      return v === '' ? null : Number(v);
    };
    const plan = this._groupPlan();
    const body = {
      model: $('groupModel').value, branching: plan.branching, select: plan.select,
      seeds: plan.seeds, node_limit: num('groupNodeLimit'), time_limit: num('groupTimeLimit'),
    };
    const button = $('groupForm').querySelector('button[type="submit"]');
    button.disabled = true;
    $('groupError').hidden = true;
    try {
      const group = await api.startGroup(body);
      this.openCompare({ group: group.id });
    } catch (err) {
      $('groupError').textContent = describeError(err);
      $('groupError').hidden = false;
    } finally {
      this._groupCount();
    }
  }

  async loadGroups() {
    const list = $('groupsList');
    let groups;
    try {
      groups = await api.groups();
    } catch (err) {
      list.replaceChildren(el('li', { class: 'muted small' }, `The comparisons could not be listed: ${err.message}`));
      return;
    }
    if (!groups.length) {
      list.replaceChildren(el('li', { class: 'muted small' }, 'None yet: start one above.'));
      return;
    }
    list.replaceChildren(...groups.map((g) => el('li', { dataset: { group: g.id } },
      el('a', { href: `#group=${encodeURIComponent(g.id)}` }, `${g.model ?? g.name}: ${g.branching.join(', ')}`),
      ' ', el('span', { class: `badge ${g.state === 'running' ? 'live' : g.state === 'done' ? 'good' : 'warn'}` }, g.state),
      g.state === 'running' ? null : el('button', { type: 'button', class: 'small ghost group-delete',
        title: 'Delete this comparison and its runs', onclick: (e) => this._deleteGroup(g, e.currentTarget) },
      'Delete'),
      el('div', { class: 'muted small' }, `${g.total} runs · ${g.select.join(', ')} · ` +
        `${String(g.created ?? '').replace('T', ' ').slice(0, 16)}`))));
  }

  /** Two clicks: the first asks, the second deletes the group with its runs. */
  async _deleteGroup(g, button) {
    if (button.dataset.confirm !== 'yes') {
      button.dataset.confirm = 'yes';
      button.textContent = `Delete it and its ${g.total} runs?`;
      return;
    }
    button.disabled = true;
    try {
      await api.deleteGroup(g.id);
    } catch (err) {
      button.replaceWith(el('span', { class: 'error small' }, describeError(err)));
      return;
    }
    await Promise.all([this.loadGroups(), this.loadRuns()]);
  }

  _solveError(text) {
    const p = $('solveError');
    p.textContent = text;
    p.hidden = false;
  }

  async _upload() {
    const file = $('uploadFile').files[0];
    const out = $('uploadResult');
    if (!file) return;
    const kind = $all('uploadKind').find((r) => r.checked)?.value ?? 'run';
    out.replaceChildren(el('p', { class: 'muted' }, `Uploading ${file.name}\u2026`));
    try {
      if (kind === 'run') {
        const r = await api.uploadRun(file);
        out.replaceChildren(el('div', { class: 'ok' },
          `${file.name} was added as run \u201c${r.id}\u201d with ${formatCount(r.nodes)} nodes. `,
          el('a', { href: `#run=${encodeURIComponent(r.id)}` }, 'Inspect it'),
          r.warnings?.length ? el('pre', {}, r.warnings.join('\n')) : null));
        this.loadRuns();
      } else {
        const m = await api.uploadModel(file);
        const rep = m.report ?? {};
        out.replaceChildren(el('div', { class: 'ok' },
          `${file.name} was added as model \u201c${m.id}\u201d` +
          (rep.rows !== undefined ? ` (${rep.rows} rows, ${rep.columns} columns, ${rep.integers} integer)` : '') +
          '. It is now in the solve form.'));
        await this.loadSolveOptions();
        $('solveModel').value = m.id;
      }
    } catch (err) {
      out.replaceChildren(errorBox(file.name, err));
    }
  }
}

function describeError(err) {
  if (!(err instanceof ApiError)) return String(err.message ?? err);
  const d = err.detail ?? {};
  const field = d.field ? ` (field ${d.field})` : '';
  return `${err.message}${field}`;
}

/** An upload error that points at the line the server named. */
function errorBox(fileName, err) {
  const d = err.detail ?? {};
  const line = d.line;
  return el('div', { class: 'error', role: 'alert' },
    el('strong', {}, `${fileName} was not accepted.`), ' ',
    line !== null && line !== undefined
      ? el('span', { class: 'line-ref', 'data-line': String(line) }, `Problem at line ${line}`
        + (d.field ? `, field \u201c${d.field}\u201d` : '') + (d.token ? `, near \u201c${d.token}\u201d` : '') + ':')
      : null,
    el('pre', {}, err.message));
}
