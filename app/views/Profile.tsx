// Line density λ(dt) of the current turn, in 1/ns (fraction of the alive particles per ns).
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { scheduleDraw } from './schedule.ts';

// Redraw at most this often while tracking [ms].
const MIN_GAP_MS = 200;

/** Bin centres [ns] of a profile over [dtMin, dtMax). */
export function binCentresNs(dtMin: number, dtMax: number, n: number): Float64Array {
  const w = (dtMax - dtMin) / n;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = (dtMin + (i + 0.5) * w) * 1e9;
  return x;
}

/** The line-density panel. */
export function Profile() {
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    xaxis: { title: { text: 'dt [ns]' }, zeroline: false },
    yaxis: { title: { text: 'λ [1/ns]' }, rangemode: 'tozero' },
    datarevision: 0,
  });
  const frame = useApp((s) => s.frame);
  useEffect(() => {
    if (!frame || frame.profile.length === 0) return; // not binned this frame (runner: PROFILE_EVERY_MS)
    const v = frame.view;
    const y = Float64Array.from(frame.profile, (p) => p * 1e-9);
    const data: Data[] = [{ type: 'scatter', mode: 'lines', x: binCentresNs(v.dtMin, v.dtMax, y.length), y, line: { color: '#1f3b5c', width: 1.4, shape: 'hvh' }, fill: 'tozeroy', fillcolor: 'rgba(63,111,153,0.15)', hoverinfo: 'x+y' } as Data];
    const L = layout.current;
    L.xaxis!.range = [v.dtMin * 1e9, v.dtMax * 1e9];
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('profile', () => ref.current && Plotly.react(ref.current, data, L, CONFIG), MIN_GAP_MS);
  }, [frame]);
  return <Panel id="profile" title="Line density" plotRef={ref} />;
}
