// Coalesces plot redraws: each plot asks to be drawn, and at most a ~12 ms slice of drawing runs per animation
// frame (oldest request first), so no single main-thread task grows long while the tracker streams frames.
// A plot may ask for a minimum gap between its redraws (slow-changing plots need not follow every frame).
interface Job {
  draw: () => void;
  minGapMs: number;
}

const pending = new Map<string, Job>();
const lastDrawn = new Map<string, number>();
let queued = false;
// Drawing time allowed per animation frame [ms]; leaves room for React and input under a 50 ms long-task limit.
const SLICE_MS = 12;

/** Ask for plot `id` to be drawn by `draw` (a newer request replaces an older one). */
export function scheduleDraw(id: string, draw: () => void, minGapMs = 0): void {
  pending.delete(id); // re-insert at the end: round robin between plots
  pending.set(id, { draw, minGapMs });
  queue();
}

function queue(): void {
  if (!queued) {
    queued = true;
    requestAnimationFrame(flush);
  }
}

function flush(): void {
  queued = false;
  const t0 = performance.now();
  for (const [id, job] of pending) {
    if (t0 - (lastDrawn.get(id) ?? -Infinity) < job.minGapMs) continue; // not due yet; stays pending
    pending.delete(id);
    const t = performance.now();
    job.draw();
    lastDrawn.set(id, performance.now());
    performance.measure('draw ' + id, { start: t }); // user timing: the browser tests report these
    if (performance.now() - t0 > SLICE_MS) break;
  }
  if (pending.size) queue();
}
