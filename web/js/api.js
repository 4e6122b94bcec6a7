// The one module that knows the server's URLs. Every request goes through
// `request`, which turns the server's error shape
// {"error": {"code", "message", "detail"}} into an ApiError.

const enc = encodeURIComponent;

export const URLS = Object.freeze({
  health: () => '/api/health',
  runs: () => '/api/runs',
  run: (id) => `/api/runs/${enc(id)}`,
  tree: (id, format = 'bin') => `/api/runs/${enc(id)}/tree?format=${format}`,
  node: (id, node) => `/api/runs/${enc(id)}/nodes/${enc(node)}`,
  series: (id, axis, points) => `/api/runs/${enc(id)}/series?x=${enc(axis)}&points=${points}`,
  findings: (id) => `/api/runs/${enc(id)}/findings`,
  steps: (id, start, count) => `/api/runs/${enc(id)}/steps?start=${start}&count=${count}`,
  notes: (id) => `/api/runs/${enc(id)}/notes`,
  note: (id, noteId) => `/api/runs/${enc(id)}/notes/${enc(noteId)}`,
  report: (ids) => `/api/report?${ids.map((id) => `run=${enc(id)}`).join('&')}`,
  stream: (id) => `/api/runs/${enc(id)}/stream`,
  uploadRun: () => '/api/runs',
  models: () => '/api/models',
  solves: () => '/api/solves',
  cancel: (id) => `/api/solves/${enc(id)}/cancel`,
  groups: () => '/api/groups',
  group: (id) => `/api/groups/${enc(id)}`,
  groupCancel: (id) => `/api/groups/${enc(id)}/cancel`,
  groupTable: (id) => `/api/groups/${enc(id)}/table`,
  compare: (ids) => `/api/compare?${ids.map((id) => `run=${enc(id)}`).join('&')}`,
  plotly: () => '/vendor/plotly.min.js',
});

export class ApiError extends Error {
  constructor(status, code, message, detail = {}) {
    super(message);
    this.status = status;
    this.code = code;
    this.detail = detail ?? {};
  }
}

async function errorOf(response) {
  let body = null;
  try {
    body = await response.json();
  } catch {
    // not JSON: fall through to a generic message
  }
  const e = body?.error;
  if (e) return new ApiError(response.status, e.code, e.message, e.detail);
  return new ApiError(response.status, `http-${response.status}`,
    `the server answered ${response.status} ${response.statusText}`);
}

async function request(url, options = {}, as = 'json') {
  let response;
  try {
    response = await fetch(url, options);
  } catch (err) {
    throw new ApiError(0, 'network', `cannot reach the server (${err.message})`);
  }
  if (!response.ok) throw await errorOf(response);
  if (as === 'buffer') return response.arrayBuffer();
  if (as === 'none') return null;
  return response.json();
}

const postJson = (url, body) => request(url, {
  method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify(body),
});

const sendJson = (url, method, body) => request(url, {
  method, headers: { 'Content-Type': 'application/json' }, body: JSON.stringify(body),
});

function upload(url, file) {
  const form = new FormData();
  form.append('file', file, file.name);
  return request(url, { method: 'POST', body: form });
}

export const api = {
  health: () => request(URLS.health()),
  runs: () => request(URLS.runs()),
  run: (id) => request(URLS.run(id)),
  treeBinary: (id) => request(URLS.tree(id, 'bin'), {}, 'buffer'),
  node: (id, node) => request(URLS.node(id, node)),
  series: (id, axis, points) => request(URLS.series(id, axis, points)),
  findings: (id) => request(URLS.findings(id)),
  steps: (id, start, count) => request(URLS.steps(id, start, count)),
  notes: (id) => request(URLS.notes(id)),
  addNote: (id, body) => postJson(URLS.notes(id), body),
  editNote: (id, noteId, body) => sendJson(URLS.note(id, noteId), 'PATCH', body),
  deleteNote: (id, noteId) => request(URLS.note(id, noteId), { method: 'DELETE' }, 'none'),
  report: (ids) => request(URLS.report(ids), {}, 'buffer'),
  models: () => request(URLS.models()),
  uploadRun: (file) => upload(URLS.uploadRun(), file),
  uploadModel: (file) => upload(URLS.models(), file),
  startSolve: (body) => postJson(URLS.solves(), body),
  cancel: (id) => request(URLS.cancel(id), { method: 'POST' }),
  groups: () => request(URLS.groups()),
  group: (id) => request(URLS.group(id)),
  startGroup: (body) => postJson(URLS.groups(), body),
  cancelGroup: (id) => request(URLS.groupCancel(id), { method: 'POST' }),
  deleteGroup: (id) => request(URLS.group(id), { method: 'DELETE' }),
  groupTable: (id) => request(URLS.groupTable(id)),
  compareTable: (ids) => request(URLS.compare(ids)),
  streamUrl: (id) => URLS.stream(id),
  plotlyUrl: () => URLS.plotly(),
};
