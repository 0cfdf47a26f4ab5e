// Waterfall: line-density profiles at the logged turns stacked against turn (heatmap, turn × dt). Rows binned
// in an older window (the view follows the bucket) are resampled onto the current bins, so dt stays true.
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import type { ProfileRow } from '../../workers/protocol.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { DENSITY_SCALE } from './PhaseSpace.tsx';
import { binCentresNs } from './Profile.tsx';
import { scheduleDraw } from './schedule.ts';

// The history changes slowly: redraw at most this often while tracking [ms].
const MIN_GAP_MS = 1000;

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
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    xaxis: { title: { text: 'dt [ns]' }, zeroline: false },
    yaxis: { title: { text: 'turn' } },
    datarevision: 0,
  });
  const profiles = useApp((s) => s.profiles);
  const frame = useApp((s) => s.frame);
  useEffect(() => {
    if (!frame || profiles.length === 0) return;
    const v = frame.view;
    const L = layout.current;
    L.datarevision = (L.datarevision as number) + 1;
    // Built when drawn, not per frame: the history is redrawn only a few times a second.
    const draw = () => {
      const n = profiles[profiles.length - 1].profile.length;
      const data: Data[] = [{
        type: 'heatmap', z: profiles.map((r) => rowFor(r, v.dtMin, v.dtMax, n)), x: Array.from(binCentresNs(v.dtMin, v.dtMax, n)),
        y: profiles.map((p) => p.turn), colorscale: DENSITY_SCALE, showscale: false, zsmooth: 'fast',
        hovertemplate: 'turn %{y}<br>dt %{x:.3g} ns<br>λ %{z:.3g}/ns<extra></extra>',
      } as Data];
      if (ref.current) Plotly.react(ref.current, data, L, CONFIG);
    };
    scheduleDraw('waterfall', draw, MIN_GAP_MS);
  }, [profiles, frame]);
  return <Panel id="waterfall" title="Profile history" plotRef={ref} />;
}
