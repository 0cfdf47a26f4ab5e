// Plotly follows window resizes only; panels also change size when a neighbour grows (a warning, the notice
// bar), so each plot div is watched and resized in the draw queue. A plot that has left the page (a closed tab)
// or is hidden is skipped: a resize queued just before would reject.
import { useEffect, type RefObject } from 'react';
import Plotly from '../plotly.ts';
import { scheduleDraw } from './schedule.ts';

/**
 * Resize the plot in `ref` whenever its box changes (after it has been drawn once). `redraw`, if given, replaces
 * Plotly's resize (a canvas layer draws itself again); it runs under the draw id `id`.
 */
export function useResize(ref: RefObject<HTMLElement | null>, id: string, redraw?: () => void): void {
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    let last = '';
    const ro = new ResizeObserver(() => {
      const size = `${el.clientWidth}x${el.clientHeight}`;
      if (size === last || !(redraw || 'data' in el) || el.clientWidth === 0) return;
      last = size;
      if (redraw) scheduleDraw(id, redraw);
      else scheduleDraw('resize-' + id, () => {
        if (el.isConnected && el.clientWidth > 0) Promise.resolve(Plotly.Plots.resize(el) as unknown).catch(() => {});
      });
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [ref, id, redraw]);
}
