// Line density λ(dt) of the current turn, in 1/ns (fraction of the alive particles per ns).
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { keepData, writeSteps } from './fastLine.ts';
import { scheduleDraw } from './schedule.ts';
import { HOVER_REDRAW_MS, usePointerOver } from './usePointerOver.ts';

// Redraw at most this often while tracking [ms].
const MIN_GAP_MS = 200;
// While tracking the y axis is held at TOP_HEADROOM × the peak until the peak leaves [TOP_LOW, 1] × the top.
const TOP_HEADROOM = 1.3, TOP_LOW = 0.5;

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
  const running = useApp((s) => s.running);
  const drawn = useRef(''); // the axes Plotly has drawn (x window, y top) while tracking, else ''
  const over = usePointerOver(ref);
  useEffect(() => {
    if (!frame || frame.profile.length === 0) return; // not binned this frame (runner: PROFILE_EVERY_MS)
    const v = frame.view;
    const y = Float64Array.from(frame.profile, (p) => p * 1e-9);
    const x = binCentresNs(v.dtMin, v.dtMax, y.length);
    const L = layout.current;
    L.xaxis!.range = [v.dtMin * 1e9, v.dtMax * 1e9];
    let peak = 0;
    for (let i = 0; i < y.length; i++) if (y[i] > peak) peak = y[i];
    if (running && peak > 0) {
      // Held axes while tracking (as the evolution plots): y to a top kept while the peak stays within
      // [TOP_LOW, 1] of it; inside them the new profile is a new SVG path.
      const top = (L.yaxis!.range as [number, number] | undefined)?.[1] ?? 0;
      const held = `${v.dtMin}|${v.dtMax}|${top}`;
      if (drawn.current === held && peak <= top && peak >= TOP_LOW * top && ref.current && writeSteps(ref.current, x, y)) {
        keepData(ref.current, x, y);
        if (!over.current) return;
        // under the pointer: Plotly's drawing in the same axes follows, at most once a second, for its hover
        const data: Data[] = [{ ...(ref.current as unknown as { data: Data[] }).data[0] }];
        L.datarevision = (L.datarevision as number) + 1;
        return scheduleDraw('profile', () => ref.current && Plotly.react(ref.current, data, L, CONFIG), HOVER_REDRAW_MS);
      }
      L.yaxis = { ...L.yaxis, autorange: false, range: [0, peak * TOP_HEADROOM] };
    } else L.yaxis = { ...L.yaxis, autorange: true };
    const key = running && peak > 0 ? `${v.dtMin}|${v.dtMax}|${peak * TOP_HEADROOM}` : '';
    drawn.current = ''; // until Plotly has drawn the new axes
    const data: Data[] = [{ type: 'scatter', mode: 'lines', x, y, line: { color: '#1f3b5c', width: 1.4, shape: 'hvh' }, fill: 'tozeroy', fillcolor: 'rgba(63,111,153,0.15)', hoverinfo: 'x+y' } as Data];
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('profile', () => {
      if (!ref.current) return;
      Plotly.react(ref.current, data, L, CONFIG);
      drawn.current = key;
    }, MIN_GAP_MS);
  }, [frame, running, over]);
  return <Panel id="profile" title="Line density" plotRef={ref} />;
}
