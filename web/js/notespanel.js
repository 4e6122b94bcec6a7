// The walkthrough's notes panel: the run's reviewer notes (GET /api/runs/{id}/notes),
// each with a link to its step, a form to add one to the current step's node,
// and edit / delete for the notes written under the name in use. A read-only
// server (editable: false) gets a sentence instead of the form and no write is
// tried; a refused write shows the server's message here.

import { api } from './api.js';
import { el } from './dom.js';
import { formatCount } from './format.js';

const AUTHOR_KEY = 'undergrowth.author';
const DEFAULT_AUTHOR = 'reviewer'; // the server's default (runlog/notes.py)
const MAX_TEXT = 4000;
const MAX_AUTHOR = 80;

function rememberedAuthor() {
  try {
    return localStorage.getItem(AUTHOR_KEY) || DEFAULT_AUTHOR;
  } catch {
    return DEFAULT_AUTHOR;
  }
}

function remember(author) {
  try {
    localStorage.setItem(AUTHOR_KEY, author);
  } catch {
    // private mode: the name is simply not remembered
  }
}

/** A name as the server keeps it: trimmed, inner runs of spaces made one (runlog/notes.py). */
function cleanName(name) {
  return String(name ?? '').split(/\s+/).filter(Boolean).join(' ') || DEFAULT_AUTHOR;
}

function when(stamp) {
  const d = new Date(stamp);
  if (Number.isNaN(d.getTime())) return '';
  return d.toLocaleString('en-GB', { day: 'numeric', month: 'short', year: 'numeric',
    hour: '2-digit', minute: '2-digit' });
}

export class NotesPanel {
  /**
   * root: the panel element; count: the heading's count; hooks: {onJump(note),
   * onChange(notes), stepOf(note) -> step or -1}
   */
  constructor(root, count, hooks = {}) {
    this.root = root;
    this.count = count;
    this.hooks = hooks;
    this.runId = null;
    this.notes = [];
    this.editable = false;
    this.stored = null;
    this.loaded = false;
    this.target = null; // {node, order, step} of the current step
    this.author = rememberedAuthor();
    this._editing = null; // id of the note being edited
    this._confirming = null; // id of the note whose delete waits for a second press
    this._token = 0;
    this._build();
  }

  _build() {
    this.message = el('p', { class: 'notes-message', role: 'status', 'aria-live': 'polite' });
    this.message.hidden = true;
    this.formArea = el('div', { class: 'notes-form-area' });
    this.list = el('ul', { class: 'notes-list', 'aria-label': 'Notes on this run' });
    this.storedLine = el('p', { class: 'muted small notes-stored' });
    this.root.replaceChildren(this.formArea, this.message, this.list, this.storedLine);
  }

  // ------------------------------------------------------------ loading
  async open(runId) {
    const token = ++this._token;
    this.runId = runId;
    this.loaded = false;
    this.notes = [];
    this._editing = null;
    this._confirming = null;
    this._say('');
    this.list.replaceChildren(el('li', { class: 'muted small' }, 'Loading the notes\u2026'));
    this.formArea.replaceChildren();
    this.storedLine.textContent = '';
    this.count.textContent = '';
    try {
      const body = await api.notes(runId);
      if (token !== this._token) return;
      this._take(body);
    } catch (err) {
      if (token !== this._token) return;
      this.list.replaceChildren();
      this._say(`The notes could not be loaded: ${err.message}`, true);
    }
  }

  close() {
    this._token++;
    this.runId = null;
  }

  /** Read the list again (after a write). */
  async reload() {
    if (!this.runId) return;
    const token = ++this._token;
    try {
      const body = await api.notes(this.runId);
      if (token === this._token) this._take(body);
    } catch (err) {
      if (token === this._token) this._say(`The notes could not be loaded: ${err.message}`, true);
    }
  }

  _take(body) {
    this.notes = body.notes ?? [];
    this.editable = body.editable === true;
    this.stored = body.stored ?? null;
    this.loaded = true;
    this.render();
    this.hooks.onChange?.(this.notes);
  }

  /** The current step's node: what a new note is attached to. */
  setTarget(target) {
    const moved = !this.target || !target || this.target.node !== target.node;
    this.target = target;
    if (moved) {
      this._labelForm();
      this._markCurrent();
    }
  }

  // ------------------------------------------------------------ drawing
  render() {
    this.count.textContent = this.loaded ? `(${formatCount(this.notes.length)})` : '';
    this._renderForm();
    this._renderList();
    this.storedLine.textContent = !this.loaded ? ''
      : this.stored === 'shelf'
        ? 'Kept on this server\u2019s notes shelf: the run\u2019s own folder is never written.'
        : 'Kept in a file beside the run log (<run file>.notes.json); the run log itself is never changed.';
  }

  /** The form (built once per load, so a note being typed survives the steps moving on). */
  _renderForm() {
    if (!this.loaded) return;
    if (!this.editable) {
      this.form = null;
      this.formArea.replaceChildren(el('p', { class: 'notes-readonly' },
        'This server is read-only: the notes can be read here, but not added, changed or removed.'));
      return;
    }
    if (this.form && this.formArea.contains(this.form)) {
      this._labelForm();
      return;
    }
    const text = el('textarea', { id: 'note-text', rows: 2, maxlength: MAX_TEXT,
      placeholder: 'What is worth knowing about this node?' });
    const author = el('input', { id: 'note-author', type: 'text', maxlength: MAX_AUTHOR,
      value: this.author, autocomplete: 'name' });
    this._formLabel = el('span', {}, '');
    const form = el('form', { class: 'notes-form', id: 'note-form' },
      el('label', { for: 'note-text', class: 'visually-hidden' }, 'Note text'),
      text,
      el('div', { class: 'notes-form-row' },
        el('label', { for: 'note-author', class: 'muted small' }, 'Your name'),
        author,
        el('button', { type: 'submit', class: 'primary small' }, 'Add note')));
    form.addEventListener('submit', (e) => {
      e.preventDefault();
      this._add(text, author.value);
    });
    author.addEventListener('change', () => {
      this.author = cleanName(author.value);
      remember(this.author);
      this._renderList();
    });
    // folded to one line until wanted: the notes themselves matter more on a small screen
    const box = el('details', { class: 'notes-add', id: 'note-add' },
      el('summary', {}, this._formLabel), form);
    box.addEventListener('toggle', () => { if (box.open) text.focus(); });
    this.form = form;
    this.formBox = box;
    this.formArea.replaceChildren(box);
    this._labelForm();
  }

  _labelForm() {
    if (!this.form) return;
    const t = this.target;
    this.formBox.hidden = !t;
    if (!t) return;
    this._formLabel.textContent = t.step >= 0
      ? `Add a note to node ${t.node} (step ${formatCount(t.step + 1)})`
      : `Add a note to node ${t.node}`;
  }

  _sorted() {
    const stepOf = (n) => this.hooks.stepOf?.(n) ?? -1;
    return this.notes.map((n) => ({ n, k: stepOf(n) }))
      .sort((a, b) => (a.k < 0) - (b.k < 0) || a.k - b.k || String(a.n.created).localeCompare(String(b.n.created)));
  }

  _renderList() {
    if (!this.loaded) return;
    if (!this.notes.length) {
      this.list.replaceChildren(el('li', { class: 'muted small notes-empty' },
        this.editable ? 'No notes yet. A note stays with its node and step for the next reviewer.'
          : 'No notes on this run.'));
      return;
    }
    this.list.replaceChildren(...this._sorted().map(({ n, k }) => this._item(n, k)));
    this._markCurrent();
  }

  _markCurrent() {
    const node = this.target?.node;
    for (const li of this.list.querySelectorAll('li[data-note]')) {
      li.classList.toggle('here', node !== undefined && li.dataset.node === String(node));
    }
  }

  _own(note) {
    return this.editable && note.author === this.author;
  }

  _item(note, k) {
    const where = k >= 0 ? `step ${formatCount(k + 1)} \u00b7 node ${note.node}` : `node ${note.node}`;
    const jump = el('button', { type: 'button', class: 'note-jump', disabled: k < 0,
      title: k >= 0 ? 'Go to this step' : 'This node was never solved, so no step shows it' }, where);
    jump.addEventListener('click', () => this.hooks.onJump?.(note));
    const head = el('div', { class: 'note-head' },
      el('span', { class: 'note-author' }, note.author),
      el('span', { class: 'muted small' }, when(note.created), note.edited ? ' (edited)' : ''),
      jump);
    const li = el('li', { class: 'note', dataset: { note: note.id, node: String(note.node ?? '') } }, head);
    if (this._editing === note.id && this._own(note)) {
      const area = el('textarea', { rows: 3, maxlength: MAX_TEXT, class: 'note-edit-text',
        'aria-label': 'Note text' });
      area.value = note.text;
      const save = el('button', { type: 'button', class: 'primary small' }, 'Save');
      const cancel = el('button', { type: 'button', class: 'small' }, 'Cancel');
      save.addEventListener('click', () => this._edit(note, area.value));
      cancel.addEventListener('click', () => {
        this._editing = null;
        this._renderList();
      });
      li.append(area, el('div', { class: 'note-actions' }, save, cancel));
      queueMicrotask(() => area.focus());
      return li;
    }
    li.append(el('p', { class: 'note-text' }, note.text));
    if (this._own(note)) {
      const actions = el('div', { class: 'note-actions' });
      if (this._confirming === note.id) {
        const yes = el('button', { type: 'button', class: 'danger small' }, 'Delete it');
        const no = el('button', { type: 'button', class: 'small' }, 'Keep');
        yes.addEventListener('click', () => this._delete(note));
        no.addEventListener('click', () => {
          this._confirming = null;
          this._renderList();
        });
        actions.append(el('span', { class: 'small' }, 'Delete this note?'), yes, no);
      } else {
        const edit = el('button', { type: 'button', class: 'small' }, 'Edit');
        const del = el('button', { type: 'button', class: 'small danger' }, 'Delete');
        edit.addEventListener('click', () => {
          this._editing = note.id;
          this._confirming = null;
          this._renderList();
        });
        del.addEventListener('click', () => {
          this._confirming = note.id;
          this._editing = null;
          this._renderList();
        });
        actions.append(edit, del);
      }
      li.append(actions);
    }
    return li;
  }

  _say(text, isError = false) {
    this.message.textContent = text;
    this.message.hidden = !text;
    this.message.classList.toggle('error', Boolean(text) && isError);
    this.message.classList.toggle('ok', Boolean(text) && !isError);
  }

  // ------------------------------------------------------------ writes
  async _write(what, call) {
    if (!this.editable) return false; // a read-only server: no write is attempted
    try {
      await call();
      this._say(what);
      await this.reload();
      return true;
    } catch (err) {
      this._refused(err);
      return false;
    }
  }

  _refused(err) {
    this._say(`The server refused: ${err.message}`, true);
    if (err.status === 403 && err.code === 'read-only') {
      this.editable = false;
      this._renderForm();
      this._renderList();
    }
  }

  async _add(textArea, author) {
    const t = this.target;
    const body = textArea.value.trim();
    if (!t) return;
    if (!body) {
      this._say('Write something first: a note needs some text.', true);
      return;
    }
    this.author = cleanName(author);
    remember(this.author);
    const payload = { text: body, node: t.node, author: this.author };
    if (t.order !== null && t.order !== undefined && t.order >= 0) payload.order = t.order;
    const ok = await this._write(`Note added to node ${t.node}.`,
      () => api.addNote(this.runId, payload));
    if (ok) textArea.value = ''; // ready for the next note
  }

  async _edit(note, text) {
    const body = text.trim();
    if (!body) {
      this._say('A note needs some text; delete it instead.', true);
      return;
    }
    this._editing = null;
    await this._write('Note changed.', () => api.editNote(this.runId, note.id, { text: body }));
  }

  async _delete(note) {
    this._confirming = null;
    await this._write('Note deleted.', () => api.deleteNote(this.runId, note.id));
  }
}
