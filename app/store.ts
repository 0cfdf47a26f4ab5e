// The one store: the setup being edited (draft), the last valid setup (what runs), validation issues, the run
// status and the latest results from the tracker. Derived physics (machine, bucket, matched bunch) is computed
// from `valid` by selectors in derived.ts, never stored here.
import { create } from 'zustand';
import type { Setup } from '../core/setup/schema.ts';
import { parseSetup, type SetupIssue } from '../core/setup/validate.ts';
import { setIn, type PathSeg } from './paths.ts';
import { defaultPreset } from './presets.ts';
import type { DiagRow, ProfileRow, RunFrame } from '../workers/protocol.ts';
import type { MatchedInfo } from '../core/beam/index.ts';
import { INITIAL_CYCLE, INITIAL_INTENSITY, type CycleState, type IntensityState } from './cycle/types.ts';

/** What the tracker is doing. */
export type RunStatus = 'starting' | 'ready' | 'running' | 'done' | 'error';

/** A message about a link or a file, one line per issue. */
export interface Notice {
  kind: 'info' | 'error';
  title: string;
  lines: string[];
}

/** Everything the store holds. */
export interface AppState {
  /** The document as edited; may be invalid. */
  draft: unknown;
  /** The last setup that validated; the tracker and the bucket view use this. */
  valid: Setup;
  /** Issues of the draft (empty when draft is valid). */
  issues: SetupIssue[];
  notice: Notice | null;
  /** Bumped whenever the beam must be regenerated (beam block changed, reset, new setup loaded). */
  beamEpoch: number;
  status: RunStatus;
  /** True while the user wants tracking to continue. */
  running: boolean;
  statusMessage: string;
  turnsPerFrame: number;
  stepTurns: number;
  /** Latest results of the tracker (turn, histogram, profile, current diagnostics). */
  frame: RunFrame | null;
  /** Per-turn diagnostics since the beam was generated (appended in place; see logVersion). */
  log: DiagRow[];
  /** Line-density profiles at the logged turns, for the waterfall. */
  profiles: ProfileRow[];
  logVersion: number;
  /** A problem the tracker found with the valid setup (e.g. a bunch larger than the bucket): its field and text. */
  runIssue: { path: string; text: string } | null;
  /** Matched-bunch numbers of the beam as generated (computed with it in the worker), null if not matched. */
  matched: MatchedInfo | null;
  /** Cycle planner settings and results, design-helper proposal (app/cycle). */
  cycle: CycleState;
  /** Intensity report of the valid setup (app/intensity). */
  intensity: IntensityState;
}

const first = defaultPreset();

/** The application store (zustand). */
export const useApp = create<AppState>(() => ({
  draft: first.setup,
  valid: first.setup,
  issues: [],
  notice: null,
  beamEpoch: 0,
  status: 'starting',
  running: false,
  statusMessage: 'starting the tracker…',
  turnsPerFrame: 20,
  stepTurns: 100,
  frame: null,
  log: [],
  profiles: [],
  logVersion: 0,
  matched: null,
  runIssue: null,
  cycle: INITIAL_CYCLE,
  intensity: INITIAL_INTENSITY,
}));

/** Replace the draft; if it validates it becomes the running setup, else the last valid one keeps running. */
export function setDraft(draft: unknown): void {
  const r = parseSetup(draft);
  const mem = r.ok ? memoryIssue(r.setup.beam.particles) : null;
  if (r.ok && !mem) useApp.setState({ draft, valid: r.setup, issues: [] });
  else useApp.setState({ draft, issues: r.ok ? [mem!] : r.errors });
}

/** Memory the browser may spend on one run [bytes]: well inside what a tab gets on an ordinary laptop (common practice). */
export const MEMORY_BUDGET = 512 * 2 ** 20;
// Per particle: dt and dE as float64 (16 bytes) in two column sets while the worker hands the beam to its kernel.
const BYTES_PER_PARTICLE = 2 * 16;
// Fixed part: histogram (160 × 120 float32), a frame's profile and 300 waterfall rows of up to 4096 bins, slack.
const FIXED_BYTES = 160 * 120 * 4 + 301 * 4096 * 8 + 2 ** 20;

/** Estimated browser memory of a run with n macroparticles [bytes]. */
export function runBytes(n: number): number {
  return FIXED_BYTES + BYTES_PER_PARTICLE * n;
}

/** Most macroparticles within the memory budget. */
export const MAX_BROWSER_PARTICLES = Math.floor((MEMORY_BUDGET - FIXED_BYTES) / BYTES_PER_PARTICLE);

/** Refusal of a particle count the browser budget cannot hold (null when it fits). */
export function memoryIssue(n: number): SetupIssue | null {
  if (runBytes(n) <= MEMORY_BUDGET) return null;
  const mb = (b: number) => `${Math.round(b / 2 ** 20)} MB`;
  return { path: 'beam.particles', value: n, message: `needs about ${mb(runBytes(n))} in the browser, over its ${mb(MEMORY_BUDGET)} budget: must be an integer in [1, ${MAX_BROWSER_PARTICLES}] here (the command line takes up to 2e7)` };
}

/** Edit one field of the draft. */
export function editField(path: readonly PathSeg[], value: unknown): void {
  setDraft(setIn(useApp.getState().draft, path, value));
}

/** Load a whole setup (preset, file or link): the beam is regenerated. */
export function loadSetup(setup: Setup, notice: Notice | null = null): void {
  const mem = memoryIssue(setup.beam.particles);
  if (mem) return void useApp.setState({ draft: setup, issues: [mem], notice }); // shown in the editor; the last valid setup keeps running
  useApp.setState((s) => ({ draft: setup, valid: setup, issues: [], notice, beamEpoch: s.beamEpoch + 1 }));
}

/** Show or clear the notice banner. */
export function setNotice(notice: Notice | null): void {
  useApp.setState({ notice });
}

/** Ask for a fresh beam from the current valid setup. */
export function resetBeam(): void {
  useApp.setState((s) => ({ beamEpoch: s.beamEpoch + 1, running: false }));
}
