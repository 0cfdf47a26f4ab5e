// Analysis worker: the cycle planner, the design helpers and the intensity report run here, off the page
// (each takes 0.05–2 s). A thin comlink shell: every answer is a value or the message of the error.
import * as Comlink from 'comlink';
import { constantBucketVoltage, fastestRamp, planCycle, type CyclePlan } from '../../core/cycle/index.ts';
import type { Setup } from '../../core/setup/schema.ts';
import { intensityReport, type IntensityReport } from '../intensity/report.ts';
import type { Answer, Proposal } from './types.ts';

// Samples of the planner (0.2 s for a 400-sample cycle) and steps of the fastest ramp (~5 ms each).
const PLAN_SAMPLES = 400;
const RAMP_STEPS = 60;

// Proposed programs keep 7 significant digits: far below the solvers' tolerance, and readable in the editor and the link.
const r7 = (x: number) => Number(x.toPrecision(7));
function rounded<P extends { start: number | null; points: [number, number][] }>(p: P): P {
  return { ...p, start: p.start === null ? null : r7(p.start), points: p.points.map(([t, v]) => [r7(t), r7(v)] as [number, number]) };
}

function answer<T>(f: () => T): Answer<T> {
  try {
    return { ok: true, value: f() };
  } catch (e) {
    return { ok: false, message: String((e as Error)?.message ?? e) };
  }
}

/** What the page may ask. */
export interface AnalysisApi {
  plan(setup: Setup, fillingLimit: number, adiabaticLimit: number): Answer<CyclePlan>;
  constantBucket(setup: Setup, target: { area: number } | { filling: number }): Answer<Proposal>;
  fastestRamp(setup: Setup, pcEnd: number, filling: number): Answer<Proposal>;
  intensity(setup: Setup): Answer<{ report: IntensityReport | null; reason: string | null }>;
}

const api: AnalysisApi = {
  plan: (setup, fillingLimit, adiabaticLimit) => answer(() => planCycle(setup, { samples: PLAN_SAMPLES, fillingLimit, adiabaticLimit })),
  constantBucket: (setup, target) =>
    answer(() => {
      const r = constantBucketVoltage(setup, target);
      const title = 'area' in target ? `bucket area held at ${r.area.toPrecision(4)} eV·s` : `filling factor held at ${target.filling}`;
      return { kind: 'voltage', title, area: r.area, programs: r.programs.map(rounded) };
    }),
  fastestRamp: (setup, pcEnd, filling) =>
    answer(() => {
      const r = fastestRamp(setup, pcEnd, { filling }, { steps: RAMP_STEPS });
      return { kind: 'momentum', title: `fastest ramp at filling factor ${filling}`, area: r.area, program: rounded(r.program) };
    }),
  intensity: (setup) => answer(() => intensityReport(setup)),
};

Comlink.expose(api);
