// The `cycle` command: the planner's table along the cycle as JSON or CSV (units in every column name), with
// the flagged intervals (bucket too small, no bucket, not adiabatic) and the machine's messages.
import { planCycle, type CycleOptions, type CyclePlan } from '../core/cycle/planner.ts';
import type { Setup } from '../core/setup/schema.ts';

const COLUMNS: [string, (p: CyclePlan) => Float64Array][] = [
  ['time_s', (p) => p.time], ['turn', (p) => p.turn], ['energy_eV', (p) => p.energy], ['gamma', (p) => p.gamma],
  ['slipFactor', (p) => p.eta], ['synchronousPhase_deg', (p) => p.phiS], ['bucketArea_eVs', (p) => p.bucketArea],
  ['bucketHalfHeight_eV', (p) => p.bucketHalfHeight], ['synchrotronFrequency_Hz', (p) => p.fs],
  ['fillingFactor', (p) => p.filling], ['adiabaticity', (p) => p.adiabaticity],
];

/** The plan as a JSON-ready object: columns by name, intervals, events. */
export function cycleJson(setup: Setup, opts?: CycleOptions): Record<string, unknown> {
  const p = planCycle(setup, opts);
  const columns: Record<string, (number | null)[]> = {};
  for (const [name, get] of COLUMNS) columns[name] = Array.from(get(p), nul);
  p.voltage.forEach((v, k) => (columns[`voltage${k}_V`] = Array.from(v, nul)));
  return {
    title: setup.title,
    beamEmittance_eVs: p.emittance,
    beamEmittanceNote: p.emittanceNote,
    transitionTime_s: nul(p.transitionTime),
    intervals: p.intervals,
    events: p.events,
    columns,
  };
}

/** The plan as CSV: intervals and events as leading `#` lines, then one row per sample. */
export function cycleCsv(setup: Setup, opts?: CycleOptions): string {
  const p = planCycle(setup, opts);
  const lines: string[] = [`# ${setup.title}`, `# beam emittance ${p.emittance} eV·s (${p.emittanceNote})`];
  if (Number.isFinite(p.transitionTime)) lines.push(`# transition at t = ${p.transitionTime} s`);
  for (const i of p.intervals) lines.push(`# ${i.kind}: ${i.message}`);
  for (const e of p.events) lines.push(`# event: ${e.message}`);
  lines.push([...COLUMNS.map(([n]) => n), ...p.voltage.map((_, k) => `voltage${k}_V`), 'flags'].join(','));
  for (let i = 0; i < p.time.length; i++) {
    const t = p.time[i];
    const flags = p.intervals.filter((iv) => t >= iv.tStart && t <= iv.tEnd).map((iv) => iv.kind).join(';');
    lines.push([...COLUMNS.map(([, g]) => g(p)[i]), ...p.voltage.map((v) => v[i]), flags].join(','));
  }
  return lines.join('\n') + '\n';
}

function nul(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}
