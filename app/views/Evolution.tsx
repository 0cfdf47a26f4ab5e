// Evolution against turn: rms bunch length, rms energy spread, rms emittance, centroid (dt and dE) and the
// fraction inside the bucket, as six small panels of one figure (one redraw per update).
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { useApp } from '../store.ts';
import { energyUnit } from '../units.ts';
import type { DiagRow } from '../../workers/protocol.ts';
import { BASE_LAYOUT, CONFIG, Panel } from './Panel.tsx';
import { scheduleDraw } from './schedule.ts';

interface Series {
  title: string;
  pick: (r: DiagRow) => number;
}

function series(eLabel: string, eK: number): Series[] {
  return [
    { title: 'rms length σt [ns]', pick: (r) => r.rmsDt * 1e9 },
    { title: `rms spread σE [${eLabel}]`, pick: (r) => r.rmsDE * eK },
    { title: 'rms emittance [eV·s]', pick: (r) => r.emittanceRms },
    { title: 'centroid dt [ns]', pick: (r) => r.meanDt * 1e9 },
    { title: `centroid dE [${eLabel}]`, pick: (r) => r.meanDE * eK },
    { title: 'inside bucket [%]', pick: (r) => r.insideFraction * 100 },
  ];
}

const ROWS = 3, COLS = 2;

function makeLayout(): Partial<Layout> {
  const L: Record<string, unknown> = {
    ...BASE_LAYOUT,
    margin: { l: 52, r: 8, t: 18, b: 34 },
    grid: { rows: ROWS, columns: COLS, pattern: 'independent', xgap: 0.22, ygap: 0.34 },
    datarevision: 0,
    annotations: [],
  };
  for (let k = 1; k <= ROWS * COLS; k++) {
    const s = k === 1 ? '' : String(k);
    L['xaxis' + s] = { title: k > (ROWS - 1) * COLS ? { text: 'turn' } : undefined, zeroline: false, tickfont: { size: 9 } };
    L['yaxis' + s] = { zeroline: false, tickfont: { size: 9 }, exponentformat: 'power' };
  }
  return L as Partial<Layout>;
}

/** The evolution panel. */
export function Evolution() {
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>(makeLayout());
  const log = useApp((s) => s.log);
  useEffect(() => {
    if (log.length === 0) return;
    let eMax = 0;
    for (const r of log) eMax = Math.max(eMax, r.rmsDE, Math.abs(r.meanDE));
    const eu = energyUnit(eMax);
    const turns = log.map((r) => r.turn);
    const list = series(eu.label, eu.toDisplay);
    const data: Data[] = list.map((s, i) => ({
      type: 'scatter', mode: 'lines', x: turns, y: log.map(s.pick),
      xaxis: i === 0 ? 'x' : `x${i + 1}`, yaxis: i === 0 ? 'y' : `y${i + 1}`,
      line: { color: '#1f3b5c', width: 1.3 }, name: s.title, hovertemplate: `turn %{x}<br>%{y:.4g}<extra>${s.title}</extra>`,
    }) as Data);
    const L = layout.current;
    // Panel titles as annotations above each subplot.
    L.annotations = list.map((s, i) => ({
      text: s.title, xref: `x${i === 0 ? '' : i + 1} domain`, yref: `y${i === 0 ? '' : i + 1} domain`, x: 0, y: 1.02,
      xanchor: 'left', yanchor: 'bottom', showarrow: false, font: { size: 10, color: '#4a5160' },
    })) as Layout['annotations'];
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('evolution', () => ref.current && Plotly.react(ref.current, data, L, CONFIG));
  }, [log]);
  return <Panel id="evolution" title="Evolution" plotRef={ref} className="evolution" />;
}
