// What the cycle view and the intensity view keep in the store: planner settings and results, the design
// helper's proposal, and the intensity report. Computed in the analysis worker (analysisWorker.ts), never on the page.
import type { CyclePlan } from '../../core/cycle/index.ts';
import type { ProgramData } from '../../core/program/index.ts';
import type { Setup } from '../../core/setup/schema.ts';
import type { IntensityReport } from '../intensity/report.ts';

/** A program proposed by a design helper, not yet applied. */
export type Proposal =
  | { kind: 'voltage'; title: string; area: number; programs: ProgramData<'voltage'>[] }
  | { kind: 'momentum'; title: string; area: number; program: ProgramData<'momentum'> };

/** A worker answer: the value, or the message of what went wrong. */
export type Answer<T> = { ok: true; value: T } | { ok: false; message: string };

/** Cycle planner state. */
export interface CycleState {
  /** Filling factor above which the bucket counts as too small, and the adiabaticity limit. */
  fillingLimit: number;
  adiabaticLimit: number;
  plan: CyclePlan | null;
  /** The setup the plan belongs to. */
  planFor: Setup | null;
  planError: string | null;
  planBusy: boolean;
  proposal: Proposal | null;
  /** What the design helper is computing, or null. */
  designBusy: string | null;
  designError: string | null;
}

/** Intensity report state. */
export interface IntensityState {
  report: IntensityReport | null;
  reportFor: Setup | null;
  error: string | null;
  busy: boolean;
}

/** Initial cycle state (planner defaults as in core/cycle). */
export const INITIAL_CYCLE: CycleState = {
  fillingLimit: 0.8, adiabaticLimit: 0.1, plan: null, planFor: null, planError: null, planBusy: false,
  proposal: null, designBusy: null, designError: null,
};

/** Initial intensity state. */
export const INITIAL_INTENSITY: IntensityState = { report: null, reportFor: null, error: null, busy: false };
