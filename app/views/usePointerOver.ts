// Whether the pointer is over an element, as a ref read when drawing (no re-render when it moves in or out).
// Plots that write new data straight into their SVG while tracking (fastLine.ts) leave Plotly's hover on its last
// drawing; while the pointer is over such a plot it also asks for Plotly's own drawing, at most once a second, so
// the read-out follows the run.
import { useEffect, useRef, type RefObject } from 'react';

/** Plotly redraws of a plot under the pointer while tracking, at most this often [ms]. */
export const HOVER_REDRAW_MS = 1000;

export function usePointerOver(ref: RefObject<HTMLElement | null>): RefObject<boolean> {
  const over = useRef(false);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const enter = () => { over.current = true; };
    const leave = () => { over.current = false; };
    el.addEventListener('pointerenter', enter);
    el.addEventListener('pointerleave', leave);
    return () => {
      el.removeEventListener('pointerenter', enter);
      el.removeEventListener('pointerleave', leave);
    };
  }, [ref]);
  return over;
}
