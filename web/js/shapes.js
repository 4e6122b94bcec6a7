// Marker shapes, traced onto anything with moveTo/lineTo/arc/rect/closePath
// (a CanvasRenderingContext2D or a Path2D). Pure: no DOM access of its own.

const SQRT3 = Math.sqrt(3);

/** Add one marker of `shape` centred at (x, y) with "radius" r to `p` as a closed sub-path. */
export function traceShape(p, shape, x, y, r) {
  switch (shape) {
    case 'dot':
      p.moveTo(x + r, y);
      p.arc(x, y, r, 0, 2 * Math.PI);
      break;
    case 'ring': { // drawn as a thick circle outline: an outer circle and an inner hole
      p.moveTo(x + r, y);
      p.arc(x, y, r, 0, 2 * Math.PI);
      const h = r * 0.5;
      p.moveTo(x + h, y);
      p.arc(x, y, h, 0, 2 * Math.PI, true);
      break;
    }
    case 'square': {
      const s = r * 0.86;
      p.rect(x - s, y - s, 2 * s, 2 * s);
      break;
    }
    case 'diamond': {
      const s = r * 1.2;
      p.moveTo(x, y - s);
      p.lineTo(x + s, y);
      p.lineTo(x, y + s);
      p.lineTo(x - s, y);
      p.closePath();
      break;
    }
    case 'triangle-down': {
      const s = r * 1.15;
      p.moveTo(x - s, y - s * 0.6);
      p.lineTo(x + s, y - s * 0.6);
      p.lineTo(x, y + s * (SQRT3 - 0.6));
      p.closePath();
      break;
    }
    case 'triangle-up': {
      const s = r * 1.15;
      p.moveTo(x - s, y + s * 0.6);
      p.lineTo(x + s, y + s * 0.6);
      p.lineTo(x, y - s * (SQRT3 - 0.6));
      p.closePath();
      break;
    }
    case 'cross': { // an X made of two bars
      const a = r * 1.1;
      const w = r * 0.42;
      p.moveTo(x - a, y - a + w);
      p.lineTo(x - a + w, y - a);
      p.lineTo(x, y - w);
      p.lineTo(x + a - w, y - a);
      p.lineTo(x + a, y - a + w);
      p.lineTo(x + w, y);
      p.lineTo(x + a, y + a - w);
      p.lineTo(x + a - w, y + a);
      p.lineTo(x, y + w);
      p.lineTo(x - a + w, y + a);
      p.lineTo(x - a, y + a - w);
      p.lineTo(x - w, y);
      p.closePath();
      break;
    }
    case 'plus': {
      const a = r * 1.15;
      const w = r * 0.38;
      p.moveTo(x - w, y - a);
      p.lineTo(x + w, y - a);
      p.lineTo(x + w, y - w);
      p.lineTo(x + a, y - w);
      p.lineTo(x + a, y + w);
      p.lineTo(x + w, y + w);
      p.lineTo(x + w, y + a);
      p.lineTo(x - w, y + a);
      p.lineTo(x - w, y + w);
      p.lineTo(x - a, y + w);
      p.lineTo(x - a, y - w);
      p.lineTo(x - w, y - w);
      p.closePath();
      break;
    }
    default:
      p.rect(x - r, y - r, 2 * r, 2 * r);
  }
}

/** The same shape as an SVG path "d" string (for legends and the help overlay). */
export function shapeSvgPath(shape, x, y, r) {
  const parts = [];
  const f = (v) => Math.round(v * 100) / 100;
  const recorder = {
    moveTo: (a, b) => parts.push(`M${f(a)} ${f(b)}`),
    lineTo: (a, b) => parts.push(`L${f(a)} ${f(b)}`),
    closePath: () => parts.push('Z'),
    rect: (a, b, w, h) => parts.push(`M${f(a)} ${f(b)}h${f(w)}v${f(h)}h${f(-w)}Z`),
    arc: (cx, cy, rr, _s, _e, ccw) => {
      const sweep = ccw ? 0 : 1;
      parts.push(`M${f(cx + rr)} ${f(cy)}A${f(rr)} ${f(rr)} 0 1 ${sweep} ${f(cx - rr)} ${f(cy)}` +
        `A${f(rr)} ${f(rr)} 0 1 ${sweep} ${f(cx + rr)} ${f(cy)}Z`);
    },
  };
  traceShape(recorder, shape, x, y, r);
  return parts.join('');
}
