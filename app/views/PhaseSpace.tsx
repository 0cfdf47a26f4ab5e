// Phase-space view: the beam as a density image (or as SVG points when few) in (dt [ns], dE [MeV or keV]), with
// the separatrix and fixed points of the bucket at the shown energy drawn over it. Layers are stacked with the
// same margins and ranges: axes (Plotly, bottom; redrawn only when the window changes), the beam (every frame: a
// canvas for the density, density.ts, or a Plotly layer for points) and the bucket (Plotly, when the bucket
// changes). The upper layers have no axes to draw, so each redraw stays a short task. The window sticks until the
// bucket or beam clearly outgrows it (the rule the runner bins by), so a ramp or a small edit redraws no axes, and
// an edit writes the bucket layer's new lines into its SVG in the edit's own task (Plotly's update follows): the
// new separatrix shows in the same frame as the new numbers.
import { useCallback, useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { bucketAt } from '../derived.ts';
import { shownPoint } from '../runner.ts';
import { useApp } from '../store.ts';
import { energyUnit } from '../units.ts';
import { chooseWindow, needsRefit } from '../viewWindow.ts';
import type { ViewWindow } from '../../workers/protocol.ts';
import type { BucketView } from '../derived.ts';
import { clearDensity, colourTable, drawDensity } from './density.ts';
import { writeTraces } from './fastLine.ts';
import { BASE_LAYOUT } from './Panel.tsx';
import { savePng } from './png.ts';
import { scheduleDraw } from './schedule.ts';
import { useResize } from './useResize.ts';

/** Density colours: pale paper to deep ink, empty cells left blank. */
export const DENSITY_SCALE: [number, string][] = [[0, '#dfe8f1'], [0.25, '#8fb3d1'], [0.55, '#3f6f99'], [0.8, '#1f3b5c'], [1, '#0e1a2b']];
const LUT = colourTable(DENSITY_SCALE);
const SEP_COLOUR = '#c0561b';
// Margins of every layer [px]: the density canvas draws into the same plot area.
const MARGIN = { l: 60, r: 14, t: 8, b: 42 };
const STATIC = { displayModeBar: false, responsive: true, staticPlot: true } as const;
// The bucket layer follows a ramp at most this often [ms].
const BUCKET_GAP_MS = 500;
// The beam layer at most this often [ms]: draws start on animation frames (~16.7 ms apart), so a 40 ms gap would
// mean every third frame (20 a second at best); 30 ms allows every second one (up to 30 a second, ≥ 20 wanted).
const BEAM_GAP_MS = 30;

// The bucket layer's three traces (always all three, so an update is a restyle of the same traces), in display units.
function bucketTraces(bv: BucketView, k: number): { x: number[][]; y: number[][] } {
  const s = bv.sep;
  const sx = s ? Array.from(s.dt, (t) => t * 1e9) : [], sy = s ? Array.from(s.dE, (e) => e * k) : [];
  return {
    x: [sx, bv.stableDt.map((t) => t * 1e9), bv.unstableDt.map((t) => t * 1e9)],
    y: [sy, bv.stableDt.map(() => 0), bv.unstableDt.map(() => 0)],
  };
}

const LINEAR = { 'xaxis.type': 'linear', 'yaxis.type': 'linear' } as const;

const BUCKET_STYLE: Data[] = [
  { type: 'scatter', mode: 'lines', line: { color: SEP_COLOUR, width: 1.6 }, name: 'separatrix' },
  { type: 'scatter', mode: 'markers', marker: { symbol: 'circle-open', size: 8, color: SEP_COLOUR }, name: 'stable fixed point' },
  { type: 'scatter', mode: 'markers', marker: { symbol: 'x-thin-open', size: 9, color: SEP_COLOUR, line: { width: 2, color: SEP_COLOUR } }, name: 'unstable fixed point' },
];

// All layers share margins and ranges; only the bottom one draws grid, ticks, titles and zero lines.
type LayerKind = 'axes' | 'beam' | 'bucket';

function layer(kind: LayerKind): Partial<Layout> {
  const on = kind === 'axes';
  // type 'linear' spares Plotly guessing the axis type from the data at every redraw; invisible axes on the upper
  // layers keep their ranges but draw no ticks, grid or lines.
  const axis = { type: 'linear' as const, visible: on, zeroline: on, zerolinecolor: '#cfd3d8', showgrid: on, showticklabels: on, ticks: on ? ('outside' as const) : ('' as const), autorange: false };
  return {
    ...BASE_LAYOUT,
    margin: MARGIN,
    xaxis: { ...axis, title: { text: on ? 'time offset dt [ns] (late →)' : '' } },
    yaxis: { ...axis, title: { text: on ? 'energy offset dE [MeV]' : '' } },
    datarevision: 0,
    ...(on ? {} : { paper_bgcolor: 'rgba(0,0,0,0)', plot_bgcolor: 'rgba(0,0,0,0)' }),
  };
}

function setRanges(L: Partial<Layout>, x: [number, number], y: [number, number], yTitle?: string): void {
  L.xaxis!.range = x;
  L.yaxis!.range = y;
  if (yTitle) L.yaxis!.title = { text: yTitle };
  L.datarevision = (L.datarevision as number) + 1;
}

/** The phase-space panel. */
export function PhaseSpace() {
  const axesRef = useRef<HTMLDivElement>(null);
  const beamRef = useRef<HTMLDivElement>(null);
  const densityRef = useRef<HTMLCanvasElement>(null);
  const pointsShown = useRef(false);
  const redrawBeam = useRef<(() => void) | null>(null); // the last beam drawing, again after a resize
  const topRef = useRef<HTMLDivElement>(null);
  const axesLayout = useRef(layer('axes'));
  const beamLayout = useRef(layer('beam'));
  const topLayout = useRef(layer('bucket'));
  useResize(axesRef, 'phase-axes');
  useResize(beamRef, 'phase-beam');
  useResize(densityRef, 'phase', useCallback(() => redrawBeam.current?.(), []));
  useResize(topRef, 'phase-bucket');
  const valid = useApp((s) => s.valid);
  const frame = useApp((s) => s.frame);
  const bv = useApp((s) => bucketAt(s.valid, shownPoint(s)));
  // The shown window: kept until the wanted one differs clearly (same rule as the runner's binning window).
  const shown = useRef<ViewWindow | null>(null);
  const want = chooseWindow(bv, frame?.current ?? null);
  if (!shown.current || needsRefit(shown.current, want)) shown.current = want;
  const win = shown.current;
  const eu = energyUnit(win.dEMax);
  const k = eu.toDisplay;
  const xr: [number, number] = [win.dtMin * 1e9, win.dtMax * 1e9];
  const yr: [number, number] = [win.dEMin * k, win.dEMax * k];
  const key = `${xr}|${yr}`;
  // The setup the bucket layer was last drawn for: a new one (an edit) is drawn at once.
  const drawnFor = useRef(valid);
  // The window the bucket layer was last laid out in: within it, a new bucket is a restyle of its traces.
  const laidOut = useRef('');

  // Axes layer: only when the window or the energy unit changes.
  useEffect(() => {
    setRanges(axesLayout.current, xr, yr, `energy offset dE [${eu.label}]`);
    scheduleDraw('axes', () => axesRef.current && Plotly.react(axesRef.current, [], axesLayout.current, STATIC));
  }, [key, eu.label]);

  // Bucket layer: separatrix, fixed points. Within the window it was laid out in, a new bucket is a restyle of its
  // traces; a new window needs a new layout (react). After an edit the restyle runs at once, in the old window
  // (the bucket margin leaves room), and a new window follows in the draw queue with the axes and beam layers.
  useEffect(() => {
    const t = bucketTraces(bv, k);
    const edited = drawnFor.current !== valid;
    drawnFor.current = valid;
    // A restyle of x and y would reset the axis types (Plotly then guesses them from the data at each redraw):
    // update keeps them linear.
    const restyle = () => topRef.current && Plotly.update(topRef.current, { x: t.x, y: t.y }, LINEAR, [0, 1, 2]);
    const layOut = () => {
      if (!topRef.current) return;
      setRanges(topLayout.current, xr, yr);
      laidOut.current = key;
      Plotly.react(topRef.current, BUCKET_STYLE.map((d, i) => ({ ...d, x: t.x[i], y: t.y[i] }) as Data), topLayout.current, STATIC);
    };
    if (edited && laidOut.current) {
      // In the edit's task: the new lines straight into the layer's SVG, in the window it is laid out in
      // (fastLine.ts: what Plotly's update would draw there), else Plotly's update at once. Plotly's own update, or
      // the layout of a new window, follows in the draw queue. (A new window is often wanted while the first frames
      // of a fresh beam arrive: drawing the edit through Plotly then took 20–45 ms.)
      if (topRef.current && writeTraces(topRef.current, t.x, t.y)) scheduleDraw('bucket', laidOut.current === key ? restyle : layOut);
      else {
        scheduleDraw('bucket', restyle, 0, true);
        if (laidOut.current !== key) scheduleDraw('bucket', layOut);
      }
    } else scheduleDraw('bucket', laidOut.current === key ? restyle : layOut, BUCKET_GAP_MS);
  }, [bv, key]);

  // Beam layer: density image (canvas) or points (Plotly).
  useEffect(() => {
    if (!frame) return;
    setRanges(beamLayout.current, xr, yr);
    const draw = () => {
      const canvas = densityRef.current;
      if (frame.points) {
        const p = frame.points;
        const x = new Float32Array(p.dt.length), y = new Float32Array(p.dt.length);
        for (let i = 0; i < x.length; i++) { x[i] = p.dt[i] * 1e9; y[i] = p.dE[i] * k; }
        // SVG points (runner.POINTS_MAX keeps them few): no WebGL, and the bundle needs no scattergl.
        const data = [{ type: 'scatter', mode: 'markers', x, y, marker: { size: 2, color: '#1f3b5c', opacity: 0.6 }, hoverinfo: 'skip', name: 'particles' } as Data];
        if (beamRef.current) Plotly.react(beamRef.current, data, beamLayout.current, STATIC);
        pointsShown.current = true;
        if (canvas) { clearDensity(canvas); canvas.dataset.counts = '0'; }
      } else {
        if (canvas) canvas.dataset.counts = String(drawDensity(canvas, frame.hist, frame.view, { margin: MARGIN, xr, yr, k }, LUT));
        if (pointsShown.current && beamRef.current) Plotly.react(beamRef.current, [], beamLayout.current, STATIC);
        pointsShown.current = false;
      }
    };
    redrawBeam.current = draw;
    scheduleDraw('phase', draw, BEAM_GAP_MS);
  }, [frame, key]);

  return (
    <section className="panel phase" aria-labelledby="phase-title">
      <header className="panel-head">
        <h2 id="phase-title">Phase space</h2>
        <span className="panel-note" id="phase-state">
          {bv.bucket ? 'separatrix and fixed points (○ stable, × unstable)' : (bv.reason ?? 'no bucket').replace(/^(?!no bucket)/, 'no bucket: ')}
        </span>
        <button type="button" className="small" title="Save this plot as a PNG image" onClick={() => savePng([axesRef.current, densityRef.current, beamRef.current, topRef.current], 'phasewell-phase-space')}>
          PNG
        </button>
      </header>
      <div className="plot stack">
        <div className="layer" id="plot-phase-axes" ref={axesRef} />
        <canvas className="layer" id="plot-phase-density" ref={densityRef} data-counts="0" />
        <div className="layer" id="plot-phase-beam" ref={beamRef} />
        <div className="layer" id="plot-phase" ref={topRef} />
      </div>
    </section>
  );
}
