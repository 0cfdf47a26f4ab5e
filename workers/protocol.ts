// Messages between the page and the tracking worker. Units as in core: dt in s, dE in eV, time in s.
import type { Setup } from '../core/setup/schema.ts';
import type { TurnDiagnostics } from '../core/diagnostics/index.ts';
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
}

/** One tracking call. */
export interface RunRequest {
  /** Turns to track at most in this call. */
  turns: number;
  /** Stop after the first turn that ends past this many milliseconds (keeps each call short). */
  budgetMs: number;
  view: ViewWindow;
  /** Return the particle coordinates when at most this many are alive. */
  pointsMax: number;
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
  /** Line density over [dtMin, dtMax] in run.profileBins bins. */
  profile: Float64Array;
  points: { dt: Float64Array; dE: Float64Array } | null;
  /** Matched-bunch numbers of a freshly generated matched beam (init/reset frames only; null otherwise). */
  matched?: MatchedInfo | null;
  /** The machine's events since turn 0 (transition switch, bucket lost or regained), at most the last MAX_EVENTS. */
  events?: MachineEvent[];
  /** Milliseconds spent tracking in this call. */
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
}
