// Resize a plot when its box changes, like views/useResize, but never a plot that has left the page: the cycle
// and intensity tabs are unmounted when closed, and a resize queued just before would reject.
import { useEffect, type RefObject } from 'react';
import Plotly from '../plotly.ts';
import { scheduleDraw } from '../views/schedule.ts';

/** Resize the plot in `ref` whenever its box changes, while it is on the page and drawn. */
export function usePlotResize(ref: RefObject<HTMLDivElement | null>, id: string): void {
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    let last = '';
    const ro = new ResizeObserver(() => {
      const size = `${el.clientWidth}x${el.clientHeight}`;
      if (size === last || !('data' in el) || el.clientWidth === 0) return;
      last = size;
      scheduleDraw('resize-' + id, () => {
        if (el.isConnected && el.clientWidth > 0) Promise.resolve(Plotly.Plots.resize(el) as unknown).catch(() => {});
      });
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [ref, id]);
}
