// The edit path of the bucket layer: after a parameter change the new separatrix and fixed points are written
// straight into the layer's existing SVG, through Plotly's own data-to-pixel maps of its fixed linear axes, so the
// edit's task spends ~1 ms here instead of a Plotly update (~9 ms on a 2-core machine). The caller then queues the
// ordinary Plotly update, which redraws the same picture and brings Plotly's own state up to date (a resize or a
// PNG export always works from that state).
// Anything unexpected (another number of fixed points, elements or maps not found) returns false: the caller then
// updates through Plotly at once.

interface AxisMap {
  l2p?: (v: number) => number;
}
interface PlotDiv extends HTMLElement {
  _fullLayout?: { xaxis?: AxisMap; yaxis?: AxisMap };
}

/** Draw line trace 0 and marker traces 1.. of the plot `el` from (x, y) in data units; false if it cannot. */
export function writeTraces(el: HTMLElement, x: readonly number[][], y: readonly number[][]): boolean {
  const fl = (el as PlotDiv)._fullLayout;
  const px = fl?.xaxis?.l2p, py = fl?.yaxis?.l2p;
  if (!px || !py) return false;
  const traces = el.querySelectorAll('.scatterlayer .trace');
  if (traces.length !== x.length) return false;
  const line = traces[0].querySelector('path.js-line');
  if (!line || x[0].length < 2) return false;
  const points = Array.from(traces).slice(1).map((t) => t.querySelectorAll('path.point'));
  if (points.some((p, k) => p.length !== x[k + 1].length)) return false;
  const xs = x[0], ys = y[0];
  let d = '';
  for (let i = 0; i < xs.length; i++) {
    const a = px(xs[i]), b = py(ys[i]);
    if (!Number.isFinite(a) || !Number.isFinite(b)) return false;
    d += `${i === 0 ? 'M' : 'L'}${a.toFixed(2)},${b.toFixed(2)}`;
  }
  line.setAttribute('d', d);
  points.forEach((list, k) => list.forEach((p, i) => p.setAttribute('transform', `translate(${px(x[k + 1][i]).toFixed(2)},${py(y[k + 1][i]).toFixed(2)})`)));
  return true;
}
