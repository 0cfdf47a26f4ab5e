// Plotly follows window resizes only; panels also change size when a neighbour grows (a warning, the notice
// bar), so each plot div is watched and resized in the draw queue.
import { useEffect, type RefObject } from 'react';
import Plotly from '../plotly.ts';
import { scheduleDraw } from './schedule.ts';

/** Resize the plot in `ref` whenever its box changes (after it has been drawn once). */
export function useResize(ref: RefObject<HTMLDivElement | null>, id: string): void {
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    let last = '';
    const ro = new ResizeObserver(() => {
      const size = `${el.clientWidth}x${el.clientHeight}`;
      if (size === last || !('data' in el)) return;
      last = size;
      scheduleDraw('resize-' + id, () => void Plotly.Plots.resize(el));
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [ref, id]);
}
