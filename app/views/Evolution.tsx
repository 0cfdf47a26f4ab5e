// Evolution against turn: rms bunch length, rms energy spread, rms emittance, centroid (dt and dE) and the
// fraction inside the bucket, as six small plots. Separate plots keep each redraw a short task.
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { energyUnit, niceAbove } from '../units.ts';
import type { DiagRow } from '../../workers/protocol.ts';
import { BASE_LAYOUT, CONFIG } from './Panel.tsx';
import { keepData, writeTraces } from './fastLine.ts';
import { scheduleDraw } from './schedule.ts';
import { useResize } from './useResize.ts';
import { usePointerOver } from './usePointerOver.ts';

interface Series {
  id: string;
  title: string;
  pick: (r: DiagRow) => number;
}

// Redraw each small plot at most this often while tracking [ms]: a trend needs no 60 Hz.
const MIN_GAP_MS = 1000;
// While tracking, the axes are held: x to the next of 1, 2, 5 × 10^k turns past the last turn tracked (to the
// run's last turn once that is at most a hundred times further), y with this headroom on each side of the data. Within
// them a new point is a new SVG path (fastLine.ts, ~0.1 ms) instead of a Plotly redraw (10–35 ms a plot, over 50 ms
// on a busy machine); the axes move, through Plotly, only when the data leaves them. Plotly's trace gets the data
// at once (a PNG export shows it); its hover follows when the run stops, or once a second under the pointer.
const HEADROOM = 0.4;

/** Held axis ranges for the points (x ascending; goal: the run's last turn), or the old ones if the points are inside. */
function heldRanges(x: number[], y: number[], goal: number, old: { x: [number, number]; y: [number, number] } | null) {
  let lo = Infinity, hi = -Infinity;
  for (const v of y) if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
  const xEnd = x[x.length - 1];
  if (old && xEnd <= old.x[1] && lo >= old.y[0] && hi <= old.y[1]) return old;
  const span = hi - lo || Math.abs(hi) || 1;
  const nice = niceAbove(Math.max(xEnd, 1));
  return { x: [0, goal >= nice && goal <= 100 * nice ? goal : nice] as [number, number], y: [lo - HEADROOM * span, hi + HEADROOM * span] as [number, number] };
}

const SERIES: Series[] = [
  { id: 'rms-length', title: 'rms length σt [ns]', pick: (r) => r.rmsDt * 1e9 },
  { id: 'rms-spread', title: 'rms spread σE [{E}]', pick: (r) => r.rmsDE },
  { id: 'emittance', title: 'rms emittance [eV·s]', pick: (r) => r.emittanceRms },
  { id: 'centroid-dt', title: 'centroid dt [ns]', pick: (r) => r.meanDt * 1e9 },
  { id: 'centroid-de', title: 'centroid dE [{E}]', pick: (r) => r.meanDE },
  { id: 'inside', title: 'inside bucket [%]', pick: (r) => r.insideFraction * 100 },
];

function SmallPlot(props: { s: Series }) {
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    margin: { l: 46, r: 6, t: 4, b: 20 },
    xaxis: { zeroline: false, nticks: 4, tickfont: { size: 9 } },
    yaxis: { zeroline: false, nticks: 4, tickfont: { size: 9 }, exponentformat: 'power' },
    datarevision: 0,
  });
  const title = useRef<HTMLHeadingElement>(null);
  useResize(ref, 'evo-' + props.s.id);
  const over = usePointerOver(ref);
  const log = useApp((s) => s.log);
  const running = useApp((s) => s.running);
  const goal = useApp((s) => s.valid.run.turns); // the run's last turn: x needs no new range before it
  const held = useRef<{ x: [number, number]; y: [number, number] } | null>(null); // ranges asked of Plotly
  const shown = useRef<{ x: [number, number]; y: [number, number] } | null>(null); // ranges Plotly has drawn
  useEffect(() => {
    if (log.length === 0) return;
    const energy = props.s.title.includes('{E}');
    let k = 1, label = props.s.title;
    if (energy) {
      let eMax = 0;
      for (const r of log) eMax = Math.max(eMax, r.rmsDE, Math.abs(r.meanDE));
      const eu = energyUnit(eMax);
      k = eu.toDisplay;
      label = label.replace('{E}', eu.label);
    }
    if (title.current) title.current.textContent = label;
    const x = log.map((r) => r.turn), y = log.map((r) => props.s.pick(r) * k);
    const data: Data[] = [{
      // Markers while there are too few points to draw a line.
      type: 'scatter', mode: log.length < 3 ? 'markers' : 'lines', marker: { size: 4, color: '#1f3b5c' }, x, y,
      line: { color: '#1f3b5c', width: 1.3 }, name: props.s.id, hovertemplate: 'turn %{x}<br>%{y:.4g}<extra></extra>',
    }];
    const L = layout.current;
    const id = 'evo-' + props.s.id;
    if (!running) {
      // Idle: Plotly's own autorange, and the data for hover and PNG.
      held.current = null;
      L.xaxis = { ...L.xaxis, autorange: true };
      L.yaxis = { ...L.yaxis, autorange: true };
    } else {
      const r = heldRanges(x, y, goal, held.current);
      // Straight into the SVG only once Plotly has drawn these axes (a draw may still wait in the queue).
      if (r === held.current && r === shown.current && log.length >= 3 && ref.current && writeTraces(ref.current, [x], [y])) {
        keepData(ref.current, x, y);
        if (!over.current) return; // else Plotly's drawing follows too (once a second at most: MIN_GAP_MS), for its hover
      }
      held.current = r;
      L.xaxis = { ...L.xaxis, autorange: false, range: r.x };
      L.yaxis = { ...L.yaxis, autorange: false, range: r.y };
    }
    L.datarevision = (L.datarevision as number) + 1;
    const r = held.current;
    scheduleDraw(id, () => {
      if (!ref.current) return;
      Plotly.react(ref.current, data, L, CONFIG);
      shown.current = r;
    }, MIN_GAP_MS);
  }, [log, props.s, running, goal, over]);
  return (
    <figure className="small-plot">
      <figcaption ref={title}>{props.s.title.replace('{E}', 'eV')}</figcaption>
      <div className="plot" id={'plot-evo-' + props.s.id} ref={ref} />
    </figure>
  );
}

/** The evolution panel: six plots against turn, with a PNG of the whole panel. */
export function Evolution() {
  const png = async () => {
    for (const s of SERIES) {
      const el = document.getElementById('plot-evo-' + s.id);
      if (el) await Plotly.downloadImage(el, { format: 'png', filename: `phasewell-evolution-${s.id}`, width: el.clientWidth * 2, height: el.clientHeight * 2 });
    }
  };
  return (
    <section className="panel evolution" aria-labelledby="evolution-title">
      <header className="panel-head">
        <h2 id="evolution-title">Evolution against turn</h2>
        <button type="button" className="small" onClick={png} title="Save the six plots as PNG images">
          PNG
        </button>
      </header>
      <div className="small-multiples">
        {SERIES.map((s) => (
          <SmallPlot key={s.id} s={s} />
        ))}
      </div>
    </section>
  );
}
