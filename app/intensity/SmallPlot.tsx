// A small plot of the intensity view, drawn through the shared draw queue when its traces change.
import { useEffect, useRef } from 'react';
import type { Data, Layout } from 'plotly.js';
import Plotly from '../plotly.ts';
import { BASE_LAYOUT, CONFIG } from '../views/Panel.tsx';
import { scheduleDraw } from '../views/schedule.ts';
import { useResize } from '../views/useResize.ts';

/** Traces against dt [ns]; `y2` names a right-hand axis for traces with yaxis 'y2'; drawn only while `active` (its tab open). */
export function SmallPlot(props: { id: string; title: string; data: Data[]; yTitle: string; y2?: string; legend?: boolean; active: boolean }) {
  const ref = useRef<HTMLDivElement>(null);
  const layout = useRef<Partial<Layout>>({
    ...BASE_LAYOUT,
    margin: { l: 54, r: props.y2 ? 50 : 8, t: 6, b: 34 },
    showlegend: props.legend ?? true,
    legend: { orientation: 'h', x: 0, y: 1, yanchor: 'bottom', font: { size: 9.5 } },
    xaxis: { title: { text: 'dt [ns] (late →)' }, zeroline: false, tickfont: { size: 9 } },
    yaxis: { title: { text: props.yTitle }, zeroline: true, zerolinecolor: '#d5d8dd', tickfont: { size: 9 }, exponentformat: 'power' },
    ...(props.y2 ? { yaxis2: { title: { text: props.y2 }, overlaying: 'y', side: 'right', rangemode: 'tozero', showgrid: false, tickfont: { size: 9 } } } : {}),
    datarevision: 0,
  } as Partial<Layout>);
  useResize(ref, 'int-' + props.id);
  useEffect(() => {
    if (!props.active) return;
    const L = layout.current;
    L.datarevision = (L.datarevision as number) + 1;
    scheduleDraw('int-' + props.id, () => ref.current && Plotly.react(ref.current, props.data, L, CONFIG));
  }, [props.data, props.id, props.active]);
  return (
    <figure className="small-plot int-plot">
      <figcaption>{props.title}</figcaption>
      <div className="plot" id={'plot-int-' + props.id} ref={ref} />
    </figure>
  );
}
