// Waterfall: line-density profiles at the logged turns stacked against turn (heatmap, turn × dt).
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { DENSITY_SCALE } from './PhaseSpace.tsx';
import { binCentresNs } from './Profile.tsx';
import { scheduleDraw } from './schedule.ts';

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
    const n = profiles[0].profile.length;
    const z = profiles.map((p) => Array.from(p.profile, (x) => x * 1e-9));
    const data: Data[] = [{
      type: 'heatmap', z, x: Array.from(binCentresNs(v.dtMin, v.dtMax, n)), y: profiles.map((p) => p.turn),
      colorscale: DENSITY_SCALE, showscale: false, zsmooth: false, hovertemplate: 'turn %{y}<br>dt %{x:.3g} ns<br>λ %{z:.3g}/ns<extra></extra>',
    } as Data];
    const L = layout.current;
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('waterfall', () => ref.current && Plotly.react(ref.current, data, L, CONFIG));
  }, [profiles, frame]);
  return <Panel id="waterfall" title="Profile history" plotRef={ref} />;
}
