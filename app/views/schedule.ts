// Coalesces plot redraws: each plot asks to be drawn, and at most a ~12 ms slice of drawing runs per frame interval
// (oldest request first), so no single main-thread task grows long while the tracker streams frames.
// Each plot is drawn in its own task (posted from an animation-frame callback, or at once while tracking), not
// inside the callback: the browser's style, layout and paint then form separate tasks instead of adding to the
// drawing ones. While every request waits for its gap, the queue sleeps on a timer until the first is due.
// While the tracker runs, a plot may ask for a minimum gap between its redraws (slow-changing plots need not
// follow every frame), and the gap also grows with the plot's last drawing time, so a slow or busy machine gets
// fewer, not longer, redraws. When the tracker is idle, edits are drawn at once.
import { useApp } from '../store.ts';

interface Job {
  draw: () => void;
  minGapMs: number;
}

const pending = new Map<string, Job>();
const lastDrawn = new Map<string, number>();
const lastCost = new Map<string, number>();
// Each plot may use at most 1/DUTY of the main thread: gap ≥ DUTY × its last drawing time. The beam picture is
// what one watches while tracking (≥ 20 pictures a second wanted): it may use up to half.
const DUTY = 8;
const DUTY_OF: Record<string, number> = { phase: 2 };

// While this says so, only urgent drawing runs (see holdDrawsWhile).
let held: () => boolean = () => false;

/** While `h()` is true only urgent draws run: the runner's workers hold every core, so drawing waits for their frame. */
export function holdDrawsWhile(h: () => boolean): void {
  held = h;
}

/** The longest last drawing time of any plot [ms] (how hard the page is pressed for its core). */
export function slowestDraw(): number {
  let m = 0;
  for (const c of lastCost.values()) if (c > m) m = c;
  return m;
}

/** Start drawing what waited while drawing was held. */
export function resumeDraws(): void {
  if (pending.size) queue();
}

// Time until plot `id` may be drawn [ms]: 0 when due, Infinity while drawing is held.
function waitFor(id: string, job: Job, now: number): number {
  if (held()) return Infinity;
  if (!useApp.getState().running) return 0;
  const gap = Math.max(job.minGapMs, (DUTY_OF[id] ?? DUTY) * (lastCost.get(id) ?? 0));
  return Math.max(0, (lastDrawn.get(id) ?? -Infinity) + gap - now);
}

let queued = false;
// Drawing time allowed per frame interval [ms]; leaves room for React, input and rendering.
const SLICE_MS = 12;

/**
 * Ask for plot `id` to be drawn by `draw` (a newer request replaces an older one). An `urgent` draw (the bucket
 * after an edit: a restyle of a few traces, a few ms) runs at once, in the caller's task, so it reaches the
 * screen in the same frame as the edit's other changes.
 */
export function scheduleDraw(id: string, draw: () => void, minGapMs = 0, urgent = false): void {
  pending.delete(id); // re-insert at the end: round robin between plots
  if (urgent) return run(id, draw, performance.now());
  pending.set(id, { draw, minGapMs });
  queue();
}

// Draw one plot now, noting when and how long (the gap rule and the user-timing measure read these).
function run(id: string, draw: () => void, start: number): void {
  draw();
  const end = performance.now();
  lastDrawn.set(id, start); // gaps run start to start: a plot drawing `cost` every DUTY·cost uses 1/DUTY of the thread
  lastCost.set(id, end - start);
  drawnMs += end - start;
  performance.measure('draw ' + id, { start }); // user timing: the browser tests report these
}

/** True while a requested redraw is due now (of plot `only`, if given). */
export function drawsDue(only?: string): boolean {
  const now = performance.now();
  for (const [id, job] of pending) if ((only === undefined || id === only) && waitFor(id, job, now) === 0) return true;
  return false;
}

const channel = new MessageChannel();
channel.port1.onmessage = flush;
// The current frame interval's start, and the drawing time spent in it [ms].
const FRAME_MS = 1000 / 60;
let frameStart = -Infinity;
let drawnMs = 0;

// The next drawing task. While tracking: at once while this frame interval's slice lasts (waiting for an animation
// frame each time delayed a due picture by up to a frame: 22–24 pictures a second instead of 26–27). Else, and when
// the slice is spent, in the next animation frame: after an edit the page paints its new numbers and separatrix
// before the other plots are drawn (drawn at once, they held that paint back by 20–40 ms).
function queue(): void {
  if (queued) return;
  queued = true;
  const now = performance.now();
  if (now - frameStart >= FRAME_MS) newFrame(now);
  if (drawnMs < SLICE_MS && useApp.getState().running) channel.port2.postMessage(null);
  else requestAnimationFrame(() => {
    newFrame(performance.now());
    channel.port2.postMessage(null);
  });
}

function newFrame(now: number): void {
  frameStart = now;
  drawnMs = 0;
}

// A timer for the first plot that waits for its gap, and when it fires.
let wake: ReturnType<typeof setTimeout> | null = null;
let wakeAt = Infinity;

function sleep(ms: number): void {
  const at = performance.now() + ms;
  if (wake !== null && wakeAt <= at) return;
  if (wake !== null) clearTimeout(wake);
  wakeAt = at;
  wake = setTimeout(() => { wake = null; wakeAt = Infinity; queue(); }, ms);
}

// Draw the oldest due plot, one plot per task; more tasks follow within this frame's slice, the rest wait. When
// none is due, the queue sleeps until the first is: posting tasks until one came due kept the thread busy (up to
// SLICE_MS of every frame while tracking), taking a core from the workers.
function flush(): void {
  queued = false;
  const now = performance.now();
  let wait = Infinity;
  for (const [id, job] of pending) {
    const w = waitFor(id, job, now);
    if (w > 0) { // not due yet; stays pending
      wait = Math.min(wait, w);
      continue;
    }
    pending.delete(id);
    run(id, job.draw, now);
    wait = 0;
    break;
  }
  if (!pending.size || held()) return; // resumeDraws restarts a held queue
  if (wait > 0) sleep(wait);
  else queue();
}
