// plotly.js, served by our server from the installed plotly package, loaded
// asynchronously: `preloadPlotly` starts the download at once, in parallel with
// the tree arrays; `loadPlotly` runs the script (evaluating 4 MB of JavaScript
// takes the main thread for a while, so the inspector asks for it once the
// first tree draw is on screen).

import { api } from './api.js';

let loading = null;
let preloaded = false;

export function preloadPlotly() {
  if (preloaded || window.Plotly) return;
  preloaded = true;
  const link = document.createElement('link');
  link.rel = 'preload';
  link.as = 'script';
  link.href = api.plotlyUrl();
  document.head.append(link);
}

export function loadPlotly() {
  if (window.Plotly) return Promise.resolve(window.Plotly);
  if (loading) return loading;
  loading = new Promise((resolve, reject) => {
    const script = document.createElement('script');
    script.src = api.plotlyUrl();
    script.async = true;
    script.onload = () => (window.Plotly ? resolve(window.Plotly)
      : reject(new Error('plotly.js loaded but did not define Plotly')));
    script.onerror = () => {
      loading = null;
      reject(new Error('plotly.js could not be loaded from the server'));
    };
    document.head.append(script);
  });
  return loading;
}
