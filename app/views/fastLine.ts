// New data written straight into a plot's existing SVG, through Plotly's own data-to-pixel maps of its fixed linear
// axes: ~1 ms instead of a Plotly update (9–45 ms on a 2-core machine). Used by the bucket layer after an edit
// (the caller then queues the ordinary Plotly update, which redraws the same picture and brings Plotly's own state
// up to date: a resize or a PNG export works from that state), and by the evolution and line-density plots while
// tracking, between the Plotly draws that move their axes.
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

/** Draw trace 0 of `el`, a step line (shape hvh) filled down to y = 0, from (x, y) in data units; false if it cannot. */
export function writeSteps(el: HTMLElement, x: ArrayLike<number>, y: ArrayLike<number>): boolean {
  const fl = (el as PlotDiv)._fullLayout;
  const px = fl?.xaxis?.l2p, py = fl?.yaxis?.l2p;
  if (!px || !py || x.length < 2 || x.length !== y.length) return false;
  const trace = el.querySelector('.scatterlayer .trace');
  const line = trace?.querySelector('path.js-line'), fill = trace?.querySelector('path.js-fill');
  if (!line || !fill) return false;
  const n = x.length;
  let d = `M${px(x[0]).toFixed(2)},${py(y[0]).toFixed(2)}`;
  for (let i = 1; i < n; i++) {
    const mid = px(0.5 * (x[i - 1] + x[i])).toFixed(2);
    d += `H${mid}V${py(y[i]).toFixed(2)}H${px(x[i]).toFixed(2)}`;
  }
  if (!/^[MHV0-9.,-]+$/.test(d)) return false; // a non-finite value: let Plotly draw it
  const base = py(0).toFixed(2);
  line.setAttribute('d', d);
  fill.setAttribute('d', `${d}V${base}H${px(x[0]).toFixed(2)}Z`);
  return true;
}

/**
 * Give trace 0 of `el` the data just written into its SVG, without a redraw: a PNG export (which draws afresh from
 * Plotly's data, in the same axes) then shows it. Hover reads Plotly's last drawing: a plot under the pointer asks
 * for one at most once a second (usePointerOver.ts).
 */
export function keepData(el: HTMLElement, x: ArrayLike<number>, y: ArrayLike<number>): void {
  const d = (el as HTMLElement & { data?: { x?: unknown; y?: unknown }[] }).data?.[0];
  if (d) { d.x = x; d.y = y; }
}
