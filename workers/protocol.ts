// Messages between the page and the tracking worker. Units as in core: dt in s, dE in eV, time in s.
import type { Endpoint } from 'comlink';
import type { KernelSpeed } from '../core/kernels/speed.ts';
import type { Setup } from '../core/setup/schema.ts';
import type { PartialMoments, PartialShape, TurnDiagnostics } from '../core/diagnostics/index.ts';
import type { MatchedInfo } from '../core/beam/index.ts';
import type { MachineEvent } from '../core/program/index.ts';

/** One row of per-turn diagnostics (the core's record). */
export type DiagRow = TurnDiagnostics;

/** A line-density profile [1/s] at one turn, binned over [dtMin, dtMax). */
export interface ProfileRow {
  turn: number;
  dtMin: number;
  dtMax: number;
  profile: Float64Array;
}

/** The window the histogram and profile are binned in. */
export interface ViewWindow {
  dtMin: number;
  dtMax: number;
  dEMin: number;
  dEMax: number;
  /** Histogram bins along dt and dE. */
  nx: number;
  ny: number;
  /**
   * Bin the frame's line density too (default true). The profile plot redraws a few times a second while the
   * picture follows every frame, so the page asks for it only that often (logged profiles are always binned).
   */
  profile?: boolean;
}

/** One tracking call. */
export interface RunRequest {
  /** Turns to track at most in this call. */
  turns: number;
  /**
   * Track no further than this turn (absolute); a call that reaches it computes fresh diagnostics. Lets the page
   * queue a call behind another without overshooting its goal (one worker; the split pool counts `turns` only).
   */
  until?: number;
  /**
   * Time budget of the call [ms], binning included: no turn starts that is expected to end past it (at least one
   * turn is tracked), so frames come at a steady pace.
   */
  budgetMs: number;
  view: ViewWindow;
  /** Return the particle coordinates when at most this many are alive. */
  pointsMax: number;
  /** Compute the current diagnostics even off the logging turns (the last call of a run); else the last row may stand in. */
  fresh?: boolean;
}

/** What the page receives after each call; the typed arrays are transferred, not copied. */
export interface RunFrame {
  turn: number;
  /** Time since turn 0 [s]. */
  time: number;
  /** Total energy of the synchronous particle at this turn [eV]. */
  Es: number;
  /** Its momentum p·c [eV] (with turn and time, where the machine resumes). */
  pc: number;
  /** Diagnostics of the current state. */
  current: DiagRow;
  /** Rows logged during this call (every run.diagnosticsEvery turns). */
  rows: DiagRow[];
  /** Line-density profiles at the logged turns, each with the window it was binned in. */
  profiles: ProfileRow[];
  view: ViewWindow;
  /** histogram2d counts, row-major [dE bin][dt bin]. */
  hist: Float32Array;
  /** Line density over [dtMin, dtMax] in run.profileBins bins; empty when view.profile was false. */
  profile: Float64Array;
  points: { dt: Float64Array; dE: Float64Array } | null;
  /** Matched-bunch numbers of a freshly generated matched beam (init/reset frames only; null otherwise). */
  matched?: MatchedInfo | null;
  /** The machine's events since turn 0 (transition switch, bucket lost or regained), at most the last MAX_EVENTS. */
  events?: MachineEvent[];
  /** Milliseconds spent tracking in this call (turns only, without diagnostics; split: the slower part). */
  trackMs: number;
  turnsDone: number;
}

/** Events a frame carries at most (a flickering bucket could log one every turn). */
export const MAX_EVENTS = 50;

/** The worker's API (exposed with comlink). */
export interface TrackApi {
  /** Generate the beam of a setup and return the frame at turn 0. */
  init(setup: Setup, view: ViewWindow, pointsMax: number): Promise<RunFrame>;
  /** Track up to req.turns turns within a time budget. */
  run(req: RunRequest): Promise<RunFrame>;
  /** New machine parameters from the next turn on; the beam is kept. */
  updateSetup(setup: Setup): Promise<void>;
  /** Regenerate the beam from the current setup. */
  reset(view: ViewWindow, pointsMax: number): Promise<RunFrame>;
  /** Copy of all particles (alive first) for export. */
  particles(): Promise<{ dt: Float64Array; dE: Float64Array; alive: number }>;
  /** Split mode: generate the whole beam of a setup, keep part `index` of `count` contiguous parts (picture with a view). */
  initPart(setup: Setup, part: Part, view: ViewWindow | null): Promise<PartFrame>;
  /** Split mode: track exactly `turns` turns; with a view, also bin the picture. */
  advance(turns: number, view: ViewWindow | null): Promise<PartFrame>;
  /** Split mode, pass 1 of the diagnostics of this part; with a view, also its line density. */
  moments(view: ViewWindow | null): Promise<{ moments: PartialMoments; profile: Float64Array | null; bucket: boolean }>;
  /** Split mode, pass 2 with the merged moments of all parts. */
  shape(all: PartialMoments, bins: number): Promise<PartialShape>;
  /**
   * Split mode: join the other worker through `port`. The lead (first part) drives both parts through it; the
   * other worker answers its advance, moments and shape calls there.
   */
  link(port: Endpoint, lead: boolean): Promise<void>;
  /** Split mode, lead only: the current frame of both parts with fresh diagnostics (after generating them). */
  splitFrame(view: ViewWindow): Promise<RunFrame>;
  /** Split mode, lead only: track both parts as run() does one beam (workers/splitLead.ts). */
  splitRun(req: RunRequest): Promise<RunFrame>;
  /** Take over a whole beam at a given turn (leaving split mode), with the setup to track it with. */
  adopt(setup: Setup, dt: Float64Array, dE: Float64Array, alive: number, at: { turn: number; time: number; pc: number }): Promise<void>;
  /** Memory this worker holds: the particle columns' buffer (the kernel's memory) and the JS heap where the browser tells it. */
  memory(): Promise<{ bufferBytes: number; heapBytes: number | null }>;
  /** Answer at once (the page's heartbeat while idle). */
  ping(): Promise<number>;
  /** Benchmark hook: speed of the turn kernel alone in this worker, 1e6 particles (core/kernels/speed.ts). */
  kernelSpeeds(): Promise<KernelSpeed[]>;
  /** Test hook: make this worker fail ('throw' an uncaught error, 'close' itself, or 'hang' in a busy loop). */
  debugFail(how: 'throw' | 'close' | 'hang'): Promise<void>;
}

/** Which contiguous slice of the generated beam a worker keeps: [floor(N·index/count), floor(N·(index+1)/count)). */
export interface Part {
  index: number;
  count: number;
}

/** What a split-mode worker returns after tracking; hist and profile only when a view was given. */
export interface PartFrame {
  turn: number;
  time: number;
  Es: number;
  pc: number;
  alive: number;
  total: number;
  /** histogram2d counts of this part (null without a view). */
  hist: Float32Array | null;
  /** Line density of this part, normalised to its own alive count (null without a view, empty when view.profile is false). */
  profile: Float64Array | null;
  matched?: MatchedInfo | null;
  events?: MachineEvent[];
  trackMs: number;
  turnsDone: number;
}
