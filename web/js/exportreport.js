// The "Export report" button of the run strip: asks the server for the run's
// self-contained review page (GET /api/report, the same page `undergrowth report`
// writes) and saves it as a file. Errors are shown beside the button.

import { api } from './api.js';

/** The file name the server also gives in its Content-Disposition header. */
export function reportFileName(runIds) {
  const [first, ...rest] = runIds;
  return rest.length ? `report-${first}-and-${rest.length}-more.html` : `report-${first}.html`;
}

export class ReportExport {
  /** button: the export button; status: a live region for progress and errors */
  constructor(button, status) {
    this.button = button;
    this.status = status;
    this.runId = null;
    this._token = 0;
    this.saved = 0; // reports saved so far (tests read it)
    button.addEventListener('click', () => this.download());
  }

  /** The run the button exports; null disables it. */
  setRun(runId) {
    this.runId = runId;
    this._token++;
    this.button.disabled = !runId;
    this._say('');
  }

  async download() {
    const runId = this.runId;
    if (!runId) return;
    const token = ++this._token;
    this.button.disabled = true;
    this._say('Writing the report\u2026');
    try {
      const buffer = await api.report([runId]);
      if (token !== this._token) return;
      const name = reportFileName([runId]);
      const url = URL.createObjectURL(new Blob([buffer], { type: 'text/html' }));
      const link = document.createElement('a');
      link.href = url;
      link.download = name;
      link.hidden = true;
      document.body.append(link);
      link.click();
      link.remove();
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
      this.saved++;
      this._say(`Report saved (${Math.max(1, Math.round(buffer.byteLength / 1024))} KiB)`, false, name);
    } catch (err) {
      if (token === this._token) this._say(`No report: ${err.message}`, true);
    } finally {
      if (token === this._token) this.button.disabled = !this.runId;
    }
  }

  _say(text, error = false, title = '') {
    this.status.textContent = text;
    this.status.title = title || text;
    this.status.classList.toggle('error', error);
  }
}
