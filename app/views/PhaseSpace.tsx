// Phase-space view: the beam as a density image (or as SVG points when few) in (dt [ns], dE [MeV or keV]), with
// the separatrix and fixed points of the bucket at the shown energy drawn over it. Three Plotly figures are
// stacked with the same margins and ranges: axes (bottom; redrawn only when the window changes), beam (every
// frame) and bucket (when the bucket changes). The two upper layers have no axes to draw, so each redraw
// stays a short task.
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { bucketAt } from '../derived.ts';
import { shownPoint } from '../runner.ts';
import { useApp } from '../store.ts';
import { energyUnit } from '../units.ts';
import { chooseWindow } from '../viewWindow.ts';
import { BASE_LAYOUT } from './Panel.tsx';
import { savePng } from './png.ts';
import { scheduleDraw } from './schedule.ts';
import { useResize } from './useResize.ts';

/** Density colours: pale paper to deep ink, empty cells left blank. */
export const DENSITY_SCALE: [number, string][] = [[0, '#dfe8f1'], [0.25, '#8fb3d1'], [0.55, '#3f6f99'], [0.8, '#1f3b5c'], [1, '#0e1a2b']];
const SEP_COLOUR = '#c0561b';
const STATIC = { displayModeBar: false, responsive: true, staticPlot: true } as const;
// The bucket layer follows a ramp at most this often [ms].
const BUCKET_GAP_MS = 500;
// The beam layer at most this often [ms]: up to 25 pictures a second (the density must update ≥ 20 times a second).
const BEAM_GAP_MS = 40;

function heatmapZ(h: Float32Array, nx: number, ny: number): (number | null)[][] {
  const z: (number | null)[][] = new Array(ny);
  for (let j = 0; j < ny; j++) {
    const row: (number | null)[] = new Array(nx);
    for (let i = 0; i < nx; i++) {
      const c = h[j * nx + i];
      row[i] = c > 0 ? c : null;
    }
    z[j] = row;
  }
  return z;
}

// All layers share margins and ranges; only the bottom one draws grid, ticks, titles and zero lines.
type LayerKind = 'axes' | 'beam' | 'bucket';

function layer(kind: LayerKind): Partial<Layout> {
  const on = kind === 'axes';
  const axis = { zeroline: on, zerolinecolor: '#cfd3d8', showgrid: on, showticklabels: on, ticks: on ? ('outside' as const) : ('' as const), autorange: false };
  return {
    ...BASE_LAYOUT,
    margin: { l: 60, r: 14, t: 8, b: 42 },
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
  const topRef = useRef<HTMLDivElement>(null);
  const axesLayout = useRef(layer('axes'));
  const beamLayout = useRef(layer('beam'));
  const topLayout = useRef(layer('bucket'));
  useResize(axesRef, 'phase-axes');
  useResize(beamRef, 'phase-beam');
  useResize(topRef, 'phase-bucket');
  const valid = useApp((s) => s.valid);
  const frame = useApp((s) => s.frame);
  const bv = useApp((s) => bucketAt(s.valid, shownPoint(s)));
  const win = chooseWindow(bv, frame?.current ?? null);
  const eu = energyUnit(win.dEMax);
  const k = eu.toDisplay;
  const xr: [number, number] = [win.dtMin * 1e9, win.dtMax * 1e9];
  const yr: [number, number] = [win.dEMin * k, win.dEMax * k];
  const key = `${xr}|${yr}`;
  // The setup the bucket layer was last drawn for: a new one (an edit) is drawn before anything else.
  const drawnFor = useRef(valid);

  // Axes layer: only when the window or the energy unit changes.
  useEffect(() => {
    setRanges(axesLayout.current, xr, yr, `energy offset dE [${eu.label}]`);
    scheduleDraw('axes', () => axesRef.current && Plotly.react(axesRef.current, [], axesLayout.current, STATIC));
  }, [key, eu.label]);

  // Bucket layer: separatrix, fixed points.
  useEffect(() => {
    const data: Data[] = [];
    if (bv.sep) {
      const s = bv.sep;
      data.push({ type: 'scatter', mode: 'lines', x: Array.from(s.dt, (t) => t * 1e9), y: Array.from(s.dE, (e) => e * k), line: { color: SEP_COLOUR, width: 1.6 }, name: 'separatrix' });
    }
    data.push({ type: 'scatter', mode: 'markers', x: bv.stableDt.map((t) => t * 1e9), y: bv.stableDt.map(() => 0), marker: { symbol: 'circle-open', size: 8, color: SEP_COLOUR }, name: 'stable fixed point' });
    data.push({ type: 'scatter', mode: 'markers', x: bv.unstableDt.map((t) => t * 1e9), y: bv.unstableDt.map(() => 0), marker: { symbol: 'x-thin-open', size: 9, color: SEP_COLOUR, line: { width: 2, color: SEP_COLOUR } }, name: 'unstable fixed point' });
    setRanges(topLayout.current, xr, yr);
    const edited = drawnFor.current !== valid;
    drawnFor.current = valid;
    scheduleDraw('bucket', () => topRef.current && Plotly.react(topRef.current, data, topLayout.current, STATIC), BUCKET_GAP_MS, edited);
  }, [bv, key]);

  // Beam layer: density image or points.
  useEffect(() => {
    if (!frame) return;
    setRanges(beamLayout.current, xr, yr);
    scheduleDraw('phase', () => {
      const data: Data[] = [];
      if (frame.points) {
        const p = frame.points;
        const x = new Float32Array(p.dt.length), y = new Float32Array(p.dt.length);
        for (let i = 0; i < x.length; i++) { x[i] = p.dt[i] * 1e9; y[i] = p.dE[i] * k; }
        // SVG points (runner.POINTS_MAX keeps them few): no WebGL, and the bundle needs no scattergl.
        data.push({ type: 'scatter', mode: 'markers', x, y, marker: { size: 2, color: '#1f3b5c', opacity: 0.6 }, hoverinfo: 'skip', name: 'particles' } as Data);
      } else {
        const v = frame.view;
        const dx = (v.dtMax - v.dtMin) / v.nx, dy = (v.dEMax - v.dEMin) / v.ny;
        data.push({
          type: 'heatmap', z: heatmapZ(frame.hist, v.nx, v.ny), x0: (v.dtMin + dx / 2) * 1e9, dx: dx * 1e9, y0: (v.dEMin + dy / 2) * k, dy: dy * k,
          colorscale: DENSITY_SCALE, showscale: false, zsmooth: 'fast', name: 'density',
        } as Data);
      }
      if (beamRef.current) Plotly.react(beamRef.current, data, beamLayout.current, STATIC);
    }, BEAM_GAP_MS);
  }, [frame, key, valid]);

  return (
    <section className="panel phase" aria-labelledby="phase-title">
      <header className="panel-head">
        <h2 id="phase-title">Phase space</h2>
        <span className="panel-note" id="phase-state">
          {bv.bucket ? 'separatrix and fixed points (○ stable, × unstable)' : (bv.reason ?? 'no bucket').replace(/^(?!no bucket)/, 'no bucket: ')}
        </span>
        <button type="button" className="small" title="Save this plot as a PNG image" onClick={() => savePng([axesRef.current, beamRef.current, topRef.current], 'phasewell-phase-space')}>
          PNG
        </button>
      </header>
      <div className="plot stack">
        <div className="layer" id="plot-phase-axes" ref={axesRef} />
        <div className="layer" id="plot-phase-beam" ref={beamRef} />
        <div className="layer" id="plot-phase" ref={topRef} />
      </div>
    </section>
  );
}
