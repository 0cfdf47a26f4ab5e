// Waterfall: line-density profiles at the logged turns stacked against turn (heatmap, turn × dt).
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { DENSITY_SCALE } from './PhaseSpace.tsx';
import { binCentresNs } from './Profile.tsx';
import { scheduleDraw } from './schedule.ts';

// The history changes slowly: redraw at most this often while tracking [ms].
const MIN_GAP_MS = 500;

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
      const n = profiles[0].profile.length;
      const data: Data[] = [{
        type: 'heatmap', z: profiles.map((p) => Array.from(p.profile, (x) => x * 1e-9)), x: Array.from(binCentresNs(v.dtMin, v.dtMax, n)),
        y: profiles.map((p) => p.turn), colorscale: DENSITY_SCALE, showscale: false, zsmooth: 'fast',
        hovertemplate: 'turn %{y}<br>dt %{x:.3g} ns<br>λ %{z:.3g}/ns<extra></extra>',
      } as Data];
      if (ref.current) Plotly.react(ref.current, data, L, CONFIG);
    };
    scheduleDraw('waterfall', draw, MIN_GAP_MS);
  }, [profiles, frame]);
  return <Panel id="waterfall" title="Profile history" plotRef={ref} />;
}
