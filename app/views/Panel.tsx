// A titled plot panel with a PNG export button; the plot div is handed to the view that draws it.
import type { ReactNode, RefObject } from 'react';
import { savePng } from './png.ts';
import { useResize } from './useResize.ts';

/** Panel frame around one Plotly plot. */
export function Panel(props: { id: string; title: string; plotRef: RefObject<HTMLDivElement | null>; extra?: ReactNode; className?: string }) {
  useResize(props.plotRef, props.id);
  const png = () => savePng([props.plotRef.current], `phasewell-${props.id}`);
  return (
    <section className={'panel ' + (props.className ?? '')} aria-labelledby={props.id + '-title'}>
      <header className="panel-head">
        <h2 id={props.id + '-title'}>{props.title}</h2>
        {props.extra}
        <button type="button" className="small" onClick={png} title="Save this plot as a PNG image">
          PNG
        </button>
      </header>
      <div className="plot" id={'plot-' + props.id} ref={props.plotRef} />
    </section>
  );
}

/** Shared layout defaults: small margins, calm fonts, no mode bar. */
export const BASE_LAYOUT = {
  margin: { l: 56, r: 12, t: 8, b: 40 },
  font: { family: 'Liberation Sans, Arial, sans-serif', size: 11, color: '#2b2f36' },
  paper_bgcolor: '#ffffff',
  plot_bgcolor: '#fbfbfa',
  showlegend: false,
} as const;

/** Plotly config for every plot. */
export const CONFIG = { displayModeBar: false, responsive: true, staticPlot: false } as const;
