// Coalesces plot redraws: each plot asks to be drawn, and at most a ~12 ms slice of drawing runs per animation
// frame (oldest request first), so no single main-thread task grows long while the tracker streams frames.
const pending = new Map<string, () => void>();
let queued = false;
// Drawing time allowed per animation frame [ms]; leaves room for React and input under a 50 ms long-task limit.
const SLICE_MS = 12;

/** Ask for plot `id` to be drawn by `draw` (a newer request replaces an older one). */
export function scheduleDraw(id: string, draw: () => void): void {
  pending.delete(id); // re-insert at the end: round robin between plots
  pending.set(id, draw);
  if (!queued) {
    queued = true;
    requestAnimationFrame(flush);
  }
}

function flush(): void {
  queued = false;
  const t0 = performance.now();
  for (const [id, draw] of pending) {
    pending.delete(id);
    draw();
    if (performance.now() - t0 > SLICE_MS) break;
  }
  if (pending.size && !queued) {
    queued = true;
    requestAnimationFrame(flush);
  }
}
