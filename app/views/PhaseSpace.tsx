// Phase-space view: the beam as a density image (or as points when few) in (dt [ns], dE [MeV or keV]), with
// the separatrix and fixed points of the bucket at the shown energy drawn over it.
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { bucketAt } from '../derived.ts';
import { shownEnergy } from '../runner.ts';
import { useApp } from '../store.ts';
import { energyUnit } from '../units.ts';
import { chooseWindow } from '../viewWindow.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { scheduleDraw } from './schedule.ts';

/** Density colours: pale paper to deep ink, empty cells left blank. */
export const DENSITY_SCALE: [number, string][] = [[0, '#dfe8f1'], [0.25, '#8fb3d1'], [0.55, '#3f6f99'], [0.8, '#1f3b5c'], [1, '#0e1a2b']];
const SEP_COLOUR = '#c0561b';

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

/** The phase-space panel. */
export function PhaseSpace() {
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    xaxis: { title: { text: 'time offset dt [ns] (late →)' }, zeroline: false },
    yaxis: { title: { text: 'energy offset dE [MeV]' }, zeroline: true, zerolinecolor: '#d0d0d0' },
    datarevision: 0,
  });
  const valid = useApp((s) => s.valid);
  const frame = useApp((s) => s.frame);
  useEffect(() => {
    const bv = bucketAt(valid, shownEnergy({ frame }));
    const win = chooseWindow(bv, frame?.current ?? null);
    const eu = energyUnit(win.dEMax);
    const k = eu.toDisplay;
    const data: Data[] = [];
    if (frame?.points) {
      const p = frame.points;
      const x = new Float32Array(p.dt.length), y = new Float32Array(p.dt.length);
      for (let i = 0; i < x.length; i++) { x[i] = p.dt[i] * 1e9; y[i] = p.dE[i] * k; }
      data.push({ type: 'scattergl', mode: 'markers', x, y, marker: { size: 2, color: '#1f3b5c', opacity: 0.6 }, hoverinfo: 'skip', name: 'particles' } as Data);
    } else if (frame) {
      const v = frame.view;
      const dx = (v.dtMax - v.dtMin) / v.nx, dy = (v.dEMax - v.dEMin) / v.ny;
      data.push({
        type: 'heatmap', z: [] as (number | null)[][], // filled when drawn (see below)
        x0: (v.dtMin + dx / 2) * 1e9, dx: dx * 1e9, y0: (v.dEMin + dy / 2) * k, dy: dy * k,
        colorscale: DENSITY_SCALE, showscale: false, hoverinfo: 'skip', zsmooth: 'fast', name: 'density',
      } as Data);
    }
    if (bv.sep) {
      const s = bv.sep;
      data.push({ type: 'scatter', mode: 'lines', x: Array.from(s.dt, (t) => t * 1e9), y: Array.from(s.dE, (e) => e * k), line: { color: SEP_COLOUR, width: 1.6 }, hoverinfo: 'skip', name: 'separatrix' });
    }
    data.push({ type: 'scatter', mode: 'markers', x: bv.stableDt.map((t) => t * 1e9), y: bv.stableDt.map(() => 0), marker: { symbol: 'circle-open', size: 8, color: SEP_COLOUR }, name: 'stable fixed point', hoverinfo: 'skip' });
    data.push({ type: 'scatter', mode: 'markers', x: bv.unstableDt.map((t) => t * 1e9), y: bv.unstableDt.map(() => 0), marker: { symbol: 'x-thin-open', size: 9, color: SEP_COLOUR, line: { width: 2, color: SEP_COLOUR } }, name: 'unstable fixed point', hoverinfo: 'skip' });
    const L = layout.current;
    L.xaxis!.range = [win.dtMin * 1e9, win.dtMax * 1e9];
    L.yaxis!.range = [win.dEMin * k, win.dEMax * k];
    (L.yaxis!.title as { text: string }).text = `energy offset dE [${eu.label}]`;
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('phase', () => {
      // Convert the histogram only for frames that are actually drawn.
      if (frame && !frame.points) (data[0] as { z: unknown }).z = heatmapZ(frame.hist, frame.view.nx, frame.view.ny);
      if (ref.current) Plotly.react(ref.current, data, L, CONFIG);
    });
  }, [valid, frame]);
  const bucket = useApp((s) => bucketAt(s.valid, shownEnergy(s)));
  return (
    <Panel
      id="phase"
      title="Phase space"
      plotRef={ref}
      className="phase"
      extra={<span className="panel-note" id="phase-state">{bucket.bucket ? 'separatrix shown' : `no bucket: ${bucket.reason}`}</span>}
    />
  );
}
