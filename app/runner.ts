// Drives the tracking worker from the store: (re)generates the beam when the beam block changes, forwards
// other setup changes (applied at the next turn, beam kept), and while running asks for one short call per
// animation frame. Only this module talks to the workers (through workers/pool.ts: one or two workers).
// Supervision: when the pool reports a failed or silent worker, a new pool replaces it, the notice bar says so,
// and the same setup is generated again from turn 0 (the setup itself, and so the URL, is untouched).
import type { Setup } from '../core/setup/schema.ts';
import type { RunFrame, RunRequest, ViewWindow } from '../workers/protocol.ts';
import { TrackPool } from '../workers/pool.ts';
import { bucketAt, type RunPoint } from './derived.ts';
import { useApp, type AppState } from './store.ts';
import { chooseWindow, needsRefit } from './viewWindow.ts';
import { drawsDue, holdDrawsWhile, resumeDraws, slowestDraw } from './views/schedule.ts';

/** Particle coordinates come back as points (not only a histogram) up to this count: SVG points stay a short draw. */
export const POINTS_MAX = 5_000;
/** Worker time budget per call [ms], binning included: a frame every ~25-35 ms (≥ 20 density pictures a second). */
const BUDGET_MS = 25;
/** While running, the frame's line density is binned at most this often [ms] (the profile plot's redraw gap). */
const PROFILE_EVERY_MS = 200;
let lastProfile = -Infinity;
/** Profiles kept for the waterfall. */
const WATERFALL_ROWS = 300;

let api: TrackPool | null = null;
// Pool generation: answers from a replaced pool are dropped.
let gen = 0;
// Calls out to the pool. Tracking calls may be two deep with one unsplit worker (see PIPELINE); others go alone.
let inflight = 0;
let lastCall = 0;
// Page and workers take turns (no drawing while a call is out, no call while draws are due) on one core, or when
// drawing has become slow (the cores are busy elsewhere). Otherwise the workers track while the page draws (on 2
// loaded cores with two workers: more pictures per second than taking turns, and no more long tasks).
let holdForDraws = false;
// A plot drawing for longer than this [ms] means the page is short of CPU: then page and workers take turns. At the
// long-task limit itself: below it, one slower plot (a profile at 37 ms under load) no longer halves the pictures.
const SLOW_DRAW_MS = 50;
const stats = { turns: 0, trackMs: 0, frames: 0 };
// Failures in the last RESTART_WINDOW_MS; past RESTART_MAX the runner stops restarting and shows the error.
let failures: number[] = [];
const RESTART_WINDOW_MS = 60_000;
const RESTART_MAX = 3;
// Idle heartbeat: ask the workers to answer when no call has been made for this long [ms].
const HEARTBEAT_MS = 2000;
let sentSetup: Setup | null = null;
let sentEpoch = -1;
let view: ViewWindow | null = null;
let goal = 0;
// A re-binned picture is wanted (window refit while paused).
let redraw = false;

/** Start the worker and the frame loop (once, at page load). */
export function startRunner(): void {
  api = newPool();
  // On one core, page and worker take turns: no drawing while a tracking call is out, no call while draws are due.
  holdDrawsWhile(() => holdForDraws && inflight > 0 && useApp.getState().running);
  // Test hook, only with ?debug in the address: make a worker fail, read how many workers track.
  const q = new URLSearchParams(location.search);
  if (q.has('debug')) (window as unknown as { __phasewellDebug: unknown }).__phasewellDebug = {
    failWorker: (how: 'throw' | 'close' | 'hang', k = 0) => api?.debugFail(how, k),
    workers: () => api?.workers ?? 0,
    memory: () => api?.memory(),
    kernelSpeeds: () => api?.kernelSpeeds(),
    trackSpeed: (turns: number, repeats: number) => api?.trackSpeed(turns, repeats),
    // Turns and worker milliseconds summed over the frames received (the browser benchmark reads Mpt/s from them).
    stats: () => ({ ...stats }),
    resetStats: () => { stats.turns = 0; stats.trackMs = 0; stats.frames = 0; },
  };
  requestAnimationFrame(tick);
}

// ?workers=1 pins one worker (to compare with the split); otherwise up to two, as the cores allow.
function newPool(): TrackPool {
  const q = new URLSearchParams(location.search);
  const max = Math.min(2, Number(q.get('workers')) || navigator.hardwareConcurrency || 1);
  const g = ++gen;
  return new TrackPool(() => new Worker(new URL('../workers/trackWorker.ts', import.meta.url), { type: 'module' }), max, (why) => {
    if (g === gen) restart(why);
  });
}

// Replace a failed pool and regenerate the same setup from turn 0, saying so in the notice bar.
function restart(why: string): void {
  const now = performance.now();
  failures = failures.filter((t) => now - t < RESTART_WINDOW_MS).concat(now);
  api?.terminate();
  inflight = tracking = 0;
  if (failures.length > RESTART_MAX) {
    api = null;
    gen++;
    fail(`${why}; it failed ${failures.length} times within a minute and was not restarted again (reload the page to retry)`);
    return;
  }
  api = newPool();
  sentSetup = null; // forces a fresh beam from the unchanged valid setup
  useApp.setState({
    running: false, status: 'starting', statusMessage: 'restarting the tracker…',
    notice: { kind: 'error', title: 'The tracker stopped and was restarted. The setup is unchanged; the beam starts again from turn 0.', lines: [why] },
  });
}

// The last run point handed out, so equal points are the same object (stable store selectors).
let lastPoint: RunPoint | null = null;

/** Where the bucket is shown: the tracker's current turn once it has run, else turn 0 (null). */
export function shownPoint(s: Pick<AppState, 'frame'>): RunPoint | null {
  const f = s.frame;
  if (!f || f.turn === 0) return null;
  if (!lastPoint || lastPoint.turn !== f.turn || lastPoint.pc !== f.pc || lastPoint.time !== f.time) lastPoint = { turn: f.turn, time: f.time, pc: f.pc };
  return lastPoint;
}

/** Run until the setup's turn count (or that many more turns when already past it). */
export function play(): void {
  const s = useApp.getState();
  const turn = s.frame?.turn ?? 0;
  goal = turn < s.valid.run.turns ? s.valid.run.turns : turn + s.valid.run.turns;
  useApp.setState({ running: true });
}

/** Track exactly n more turns, then stop. */
export function step(n: number): void {
  goal = (useApp.getState().frame?.turn ?? 0) + n;
  useApp.setState({ running: true });
}

/** Stop after the call in flight. */
export function pause(): void {
  useApp.setState({ running: false, statusMessage: 'pausing…' });
}

/** All particles (alive first), for export. */
export async function fetchParticles(): Promise<{ dt: Float64Array; dE: Float64Array; alive: number } | null> {
  return api && inflight === 0 ? api.particles() : null;
}

/** Number of workers tracking the current beam (1, or 2 when it is split). */
export function workerCount(): number {
  return api?.workers ?? 0;
}

// Core errors name the field first ("beam.distribution.size.value = 5 eV·s: ..."): show them next to it too.
const FIELD_FIRST = /^([A-Za-z]\w*(?:\.\w+|\[\d+\])*) = /;

function fail(message: string): void {
  const m = FIELD_FIRST.exec(message);
  useApp.setState({ status: 'error', statusMessage: message, running: false, runIssue: m ? { path: m[1], text: message } : null });
}

// The beam must be regenerated when it has not been tracked yet or when what defines it changed.
function needsNewBeam(prev: Setup | null, next: Setup, turn: number): boolean {
  if (!prev) return true;
  if (prev === next) return false;
  if (turn === 0) return true;
  const key = (s: Setup) => JSON.stringify([s.beam, s.particle, s.energy.start]);
  return key(prev) !== key(next);
}

function tick(): void {
  requestAnimationFrame(tick);
  pump();
}

// The next worker call, if one is wanted; also called as soon as a frame arrives, so the worker does not wait for
// an animation frame between calls.
function pump(): void {
  if (!api) return;
  const s = useApp.getState();
  const pool = api, g = gen;
  const turn = s.frame?.turn ?? 0;
  if (inflight > 0) {
    // Tracking on two or more cores: queue the next call behind the one out (in the worker, or in the pool when the
    // beam is split), so tracking goes on at once instead of waiting for the page to take the frame and ask again
    // (the page is often busy drawing). The goal travels as an absolute turn, so the queued call cannot overshoot it.
    if (inflight === 1 && tracking === 1 && s.running && s.frame && !holdForDraws && turn < goal)
      track(s, turn);
    return;
  }
  if (s.beamEpoch !== sentEpoch || needsNewBeam(sentSetup, s.valid, turn)) {
    const setup = s.valid;
    sentEpoch = s.beamEpoch;
    sentSetup = setup;
    view = chooseWindow(bucketAt(setup, null), null);
    call(() => api!.init(setup, view!, POINTS_MAX), true, 'generating the beam…');
  } else if (s.valid !== sentSetup) {
    const setup = s.valid;
    sentSetup = setup;
    inflight++;
    lastCall = performance.now();
    pool.updateSetup(setup).then(() => { if (g === gen) inflight--; }, (e) => { if (g !== gen) return; inflight--; fail(String((e as Error).message ?? e)); });
  } else if (redraw && !s.running && s.frame) {
    redraw = false;
    call(() => api!.run({ turns: 0, budgetMs: BUDGET_MS, view: view!, pointsMax: POINTS_MAX }), false, 'binning');
  } else if (s.running && s.frame) {
    // With two or more cores the workers track the next frame while the page draws this one. On one core, due
    // redraws go first: the worker rests while the page draws instead of competing.
    if (holdForDraws && drawsDue()) return;
    if (turn >= goal) useApp.setState({ running: false, status: 'done', statusMessage: `stopped at turn ${turn}` });
    else {
      track(s, turn);
      pump(); // a second call, queued behind this one, where that helps
    }
  } else if (performance.now() - lastCall > HEARTBEAT_MS) {
    lastCall = performance.now();
    inflight++;
    pool.ping().then(() => { if (g === gen) inflight--; }, () => { if (g === gen) inflight--; });
  }
}

// Tracking calls out (a second one may be queued behind the first).
let tracking = 0;

function track(s: AppState, turn: number): void {
  const req = trackRequest(s, turn), g = gen;
  tracking++;
  call(() => api!.run(req).finally(() => { if (g === gen) tracking--; }), false, 'tracking');
}

// The next tracking call from the last frame the page has: turns up to the goal (an unsplit worker also gets the
// goal itself, for a queued call); the call that can reach the goal computes the final diagnostics even off a
// logging turn, and bins the line density, which otherwise is binned only every PROFILE_EVERY_MS.
function trackRequest(s: AppState, turn: number): RunRequest {
  const turns = Math.min(s.turnsPerFrame, goal - turn);
  const last = turn + turns >= goal;
  const profile = last || performance.now() - lastProfile >= PROFILE_EVERY_MS;
  if (profile) lastProfile = performance.now();
  return { turns, until: goal, budgetMs: BUDGET_MS, view: { ...view!, profile }, pointsMax: POINTS_MAX, fresh: last };
}

function call(fn: () => Promise<RunFrame>, fresh: boolean, what: string): void {
  inflight++;
  lastCall = performance.now();
  const g = gen;
  if (fresh) useApp.setState({ statusMessage: what });
  fn().then(
    (f) => {
      if (g !== gen) return; // from a replaced pool
      inflight--;
      const t = performance.now();
      accept(f, fresh);
      if (!holdForDraws && useApp.getState().running) setTimeout(pump); // no wait for an animation frame
      else resumeDraws();
      // User timing of the store update and the React render it schedules (a microtask queued before this one).
      queueMicrotask(() => performance.measure('accept frame', { start: t }));
    },
    (e) => {
      if (g !== gen) return;
      inflight--;
      fail(String((e as Error)?.message ?? e));
    },
  );
}

// Store a frame: append the logged rows and profiles, and refit the view window if the beam outgrew it.
function accept(f: RunFrame, fresh: boolean): void {
  const s = useApp.getState();
  stats.turns += f.turnsDone;
  stats.trackMs += f.trackMs;
  stats.frames++;
  holdForDraws = (navigator.hardwareConcurrency || 1) < 2 || slowestDraw() > SLOW_DRAW_MS;
  const log = fresh ? f.rows : s.log.concat(f.rows);
  let profiles = fresh ? f.profiles : s.profiles.concat(f.profiles);
  if (profiles.length > WATERFALL_ROWS) profiles = profiles.slice(profiles.length - WATERFALL_ROWS);
  const running = s.running;
  useApp.setState({
    frame: f, log, profiles, logVersion: s.logVersion + 1, ...(fresh ? { matched: f.matched ?? null, runIssue: null } : {}),
    status: running ? 'running' : 'ready',
    statusMessage: running ? `tracking: ${f.turnsDone} turns in ${f.trackMs.toFixed(0)} ms` : fresh || f.turn === 0 ? 'ready' : `paused at turn ${f.turn}`,
  });
  // Paused between logging turns: the diagnostics shown are older than the picture; a 0-turn call refreshes them.
  if (!running && !fresh && f.current.turn !== f.turn) redraw = true;
  const want = chooseWindow(bucketAt(s.valid, shownPoint({ frame: f })), f.current);
  if (view && needsRefit(view, want)) {
    view = want;
    redraw = true;
  }
}
