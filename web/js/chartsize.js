// Keep plotly charts sized to their elements: plotly only follows window
// resizes, while our panels also change size when tabs switch or text wraps.

const watched = new WeakSet();

export function followSize(div) {
  if (watched.has(div)) return;
  watched.add(div);
  let pending = 0;
  new ResizeObserver(() => {
    if (pending || !window.Plotly || !div.data || div.offsetParent === null) return;
    pending = requestAnimationFrame(() => {
      pending = 0;
      window.Plotly.Plots.resize(div);
    });
  }).observe(div);
}
