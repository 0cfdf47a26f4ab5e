// Waterfall: line-density profiles at the logged turns stacked against turn (turn × dt). Rows binned in an older
// window (the view follows the bucket) are resampled onto the current bins, so dt stays true.
// Drawn as the phase-space density is: Plotly draws the axes (again only when they move), and the rows are an
// image on a canvas layer over them (density.ts), each row from its turn halfway to its neighbours'. A Plotly
// heatmap of the history took 16–51 ms a draw while tracking (it encodes its image as a PNG at every draw).
import { useCallback, useEffect, useRef } from 'react';
import type { Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { fmt, niceAbove } from '../units.ts';
import type { ProfileRow } from '../../workers/protocol.ts';
import { cellImage, colourTable, plotArea } from './density.ts';
import { BASE_LAYOUT, CONFIG } from './Panel.tsx';
import { DENSITY_SCALE } from './PhaseSpace.tsx';
import { savePng } from './png.ts';
import { scheduleDraw } from './schedule.ts';
import { useResize } from './useResize.ts';

// The history changes slowly: redraw at most this often while tracking [ms].
const MIN_GAP_MS = 1000;
const LUT = colourTable(DENSITY_SCALE);
const MARGIN = BASE_LAYOUT.margin;

// Converted rows, kept until the window changes: each redraw then converts only the new rows.
const converted = new WeakMap<ProfileRow, { key: string; values: number[] }>();

function rowFor(r: ProfileRow, dtMin: number, dtMax: number, n: number): number[] {
  const key = `${dtMin}|${dtMax}|${n}`;
  const hit = converted.get(r);
  if (hit && hit.key === key) return hit.values;
  const values = resampleRow(r, dtMin, dtMax, n);
  converted.set(r, { key, values });
  return values;
}

/** Row values [1/ns] at n bins over [dtMin, dtMax): copied when the window matches, else interpolated. */
export function resampleRow(r: ProfileRow, dtMin: number, dtMax: number, n: number): number[] {
  const p = r.profile;
  if (r.dtMin === dtMin && r.dtMax === dtMax && p.length === n) return Array.from(p, (x) => x * 1e-9);
  const out = new Array<number>(n);
  const w = (r.dtMax - r.dtMin) / p.length;
  for (let i = 0; i < n; i++) {
    const t = dtMin + ((i + 0.5) * (dtMax - dtMin)) / n;
    const u = (t - r.dtMin) / w - 0.5; // fractional index among the row's bin centres
    const j = Math.floor(u);
    if (u < -0.5 || u > p.length - 0.5) out[i] = 0;
    else {
      const a = p[Math.max(0, Math.min(p.length - 1, j))], b = p[Math.max(0, Math.min(p.length - 1, j + 1))];
      out[i] = (a + (b - a) * (u - j)) * 1e-9;
    }
  }
  return out;
}

/** The profile-history panel. */
export function Waterfall() {
  const axesRef = useRef<HTMLDivElement>(null);
  const rowsRef = useRef<HTMLCanvasElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    xaxis: { title: { text: 'dt [ns]' }, zeroline: false, type: 'linear', autorange: false },
    yaxis: { title: { text: 'turn' }, zeroline: false, type: 'linear', autorange: false },
    datarevision: 0,
  });
  const shownAxes = useRef(''); // the ranges Plotly last drew
  const cells = useRef(new Float32Array(0)); // the rows' values, reused from drawing to drawing
  // What the canvas shows, for the pointer's read-out (the canvas has no hover of its own).
  const shown = useRef<{ hist: Float32Array; n: number; turns: number[]; edge: (j: number) => number; xr: [number, number]; yr: [number, number] } | null>(null);
  const redraw = useRef<(() => void) | null>(null); // the last drawing, again after a resize
  useResize(axesRef, 'waterfall');
  useResize(rowsRef, 'waterfall-rows', useCallback(() => redraw.current?.(), []));
  const profiles = useApp((s) => s.profiles);
  const frame = useApp((s) => s.frame);
  useEffect(() => {
    if (!frame || profiles.length === 0) return;
    const v = frame.view;
    // Built when drawn, not per frame: the history is redrawn at most once a second while tracking.
    const draw = () => {
      const rows = profiles.length, n = profiles[rows - 1].profile.length;
      const turns = profiles.map((p) => p.turn);
      // Row j spans from halfway to the previous row's turn to halfway to the next one's (a lone row: ±½ turn).
      const edge = (j: number) => (j <= 0 ? turns[0] - 0.5 * (rows > 1 ? turns[1] - turns[0] : 1) : j >= rows ? turns[rows - 1] + 0.5 * (rows > 1 ? turns[rows - 1] - turns[rows - 2] : 1) : 0.5 * (turns[j - 1] + turns[j]));
      const xr: [number, number] = [v.dtMin * 1e9, v.dtMax * 1e9];
      const yr: [number, number] = [Math.min(0, edge(0)), niceAbove(Math.max(edge(rows), 1))];
      const key = `${xr}|${yr}`;
      const L = layout.current;
      if (shownAxes.current !== key && axesRef.current) {
        L.xaxis!.range = xr;
        L.yaxis!.range = yr;
        L.datarevision = (L.datarevision as number) + 1;
        Plotly.react(axesRef.current, [], L, CONFIG);
        shownAxes.current = key;
      }
      const canvas = rowsRef.current;
      if (!canvas) return;
      if (cells.current.length < rows * n) cells.current = new Float32Array(2 * rows * n); // grows with the log
      const hist = cells.current.subarray(0, rows * n);
      for (let j = 0; j < rows; j++) hist.set(rowFor(profiles[j], v.dtMin, v.dtMax, n), j * n);
      const { image, total } = cellImage(canvas, hist, n, rows, LUT);
      shown.current = { hist, n, turns, edge, xr, yr };
      canvas.dataset.rows = String(rows);
      canvas.dataset.total = total.toPrecision(6);
      const area = plotArea(canvas, { margin: MARGIN, xr, yr, k: 1 });
      if (!area) return;
      const { g, X, Y } = area, x0 = X(xr[0]), x1 = X(xr[1]);
      const step = rows > 1 ? turns[1] - turns[0] : 1;
      if (turns.every((t, j) => t === turns[0] + j * step)) g.drawImage(image, x0, Y(edge(rows)), x1 - x0, Y(edge(0)) - Y(edge(rows)));
      else {
        // Uneven rows (the logging interval changed): each on its own, edges on whole pixels (no seams).
        for (let j = 0; j < rows; j++) {
          const top = Math.round(Y(edge(j + 1))), bottom = Math.round(Y(edge(j)));
          if (bottom > top) g.drawImage(image, 0, rows - 1 - j, n, 1, x0, top, x1 - x0, bottom - top); // image row rows−1−j is row j
        }
      }
    };
    redraw.current = draw;
    scheduleDraw('waterfall', draw, MIN_GAP_MS);
  }, [profiles, frame]);
  // Turn, dt and λ under the pointer, as the canvas's tooltip.
  const readOut = (e: React.MouseEvent<HTMLCanvasElement>) => {
    const c = e.currentTarget, sh = shown.current;
    if (!sh) return;
    const W = c.clientWidth - MARGIN.l - MARGIN.r, H = c.clientHeight - MARGIN.t - MARGIN.b;
    const dt = sh.xr[0] + ((e.nativeEvent.offsetX - MARGIN.l) / W) * (sh.xr[1] - sh.xr[0]);
    const turn = sh.yr[1] - ((e.nativeEvent.offsetY - MARGIN.t) / H) * (sh.yr[1] - sh.yr[0]);
    const i = Math.floor(((dt - sh.xr[0]) / (sh.xr[1] - sh.xr[0])) * sh.n);
    let j = 0;
    while (j < sh.turns.length && sh.edge(j + 1) <= turn) j++;
    const inside = i >= 0 && i < sh.n && j < sh.turns.length && turn >= sh.edge(0);
    c.title = inside ? `turn ${sh.turns[j]}, dt ${fmt(dt)} ns: λ ${fmt(sh.hist[j * sh.n + i])}/ns` : '';
  };
  return (
    <section className="panel" aria-labelledby="waterfall-title">
      <header className="panel-head">
        <h2 id="waterfall-title">Profile history</h2>
        <button type="button" className="small" onClick={() => savePng([axesRef.current, rowsRef.current], 'phasewell-waterfall')} title="Save this plot as a PNG image">
          PNG
        </button>
      </header>
      <div className="plot stack">
        <div className="layer" id="plot-waterfall" ref={axesRef} />
        <canvas className="layer" id="plot-waterfall-rows" ref={rowsRef} data-rows="0" onMouseMove={readOut} />
      </div>
    </section>
  );
}
