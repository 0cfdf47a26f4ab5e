// One small plot against cycle time [ms] with the flagged intervals shaded and, optionally, the tracker's
// current time as a vertical line. Drawn through the shared draw queue so each redraw stays a short task.
import { useEffect, useRef } from 'react';
import type { Data, Layout, Shape } from 'plotly.js';
import Plotly from '../plotly.ts';
import { BASE_LAYOUT, CONFIG } from '../views/Panel.tsx';
import { scheduleDraw } from '../views/schedule.ts';
import { useResize } from '../views/useResize.ts';
import type { CycleInterval } from '../../core/cycle/index.ts';

/** Shading of each kind of flagged interval. */
export const FLAG_COLOUR: Record<CycleInterval['kind'], string> = {
  overfilled: 'rgba(192,86,27,0.16)',
  noBucket: 'rgba(90,90,90,0.20)',
  nonAdiabatic: 'rgba(226,154,59,0.22)',
};

// The tracker's time marker follows at most this often [ms].
const MARK_GAP_MS = 1000;

/** A plot of traces against time with shaded intervals; `mark` is the tracker's time [s] or null; `zero` keeps 0 on the y axis; drawn only while `active` (its tab open). */
export function CyclePlot(props: {
  id: string; title: string; data: Data[]; intervals: CycleInterval[]; mark: number | null; logY?: boolean; zero?: boolean; vlines?: number[]; active: boolean;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    margin: { l: 50, r: 6, t: 4, b: 22 },
    xaxis: { zeroline: false, nticks: 6, tickfont: { size: 9 }, title: { text: '' } },
    yaxis: { zeroline: false, nticks: 4, tickfont: { size: 9 }, exponentformat: 'power' },
    datarevision: 0,
  });
  useResize(ref, 'cycle-' + props.id);
  const { data, intervals, mark, logY, zero, vlines, active } = props;
  useEffect(() => {
    if (!active) return;
    const L = layout.current;
    const shapes: Partial<Shape>[] = intervals.map((iv) => ({
      type: 'rect', xref: 'x', yref: 'paper', x0: iv.tStart * 1e3, x1: iv.tEnd * 1e3, y0: 0, y1: 1,
      fillcolor: FLAG_COLOUR[iv.kind], line: { width: 0 }, layer: 'below',
    }));
    for (const t of vlines ?? []) shapes.push({ type: 'line', xref: 'x', yref: 'paper', x0: t * 1e3, x1: t * 1e3, y0: 0, y1: 1, line: { color: '#777', width: 1, dash: 'dot' } });
    if (mark !== null) shapes.push({ type: 'line', xref: 'x', yref: 'paper', x0: mark * 1e3, x1: mark * 1e3, y0: 0, y1: 1, line: { color: '#2f6b3a', width: 1.2 } });
    L.shapes = shapes as Shape[];
    L.yaxis!.type = logY ? 'log' : 'linear';
    L.yaxis!.rangemode = zero ? 'tozero' : 'normal';
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('cycle-' + props.id, () => ref.current && Plotly.react(ref.current, data, L, CONFIG), MARK_GAP_MS);
  }, [data, intervals, mark, logY, zero, vlines, props.id, active]);
  return (
    <figure className="small-plot">
      <figcaption>{props.title}</figcaption>
      <div className="plot" id={'plot-cycle-' + props.id} ref={ref} />
    </figure>
  );
}
