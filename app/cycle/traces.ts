// Plot traces of a cycle plan (time in ms on x), with a design proposal drawn dashed over the current program.
import type { Data } from 'plotly.js';
import type { CyclePlan } from '../../core/cycle/index.ts';
import type { Proposal } from './types.ts';

const INK = '#1f3b5c';
const RUST = '#c0561b';
const GREEN = '#2f6b3a';
const SYSTEM_COLOURS = [INK, '#6a4c93', '#1b7f79', '#8a5a00'];

function line(x: ArrayLike<number>, y: ArrayLike<number>, name: string, colour: string, dash = 'solid'): Data {
  return { type: 'scatter', mode: 'lines', x: Array.from(x), y: Array.from(y), name, line: { color: colour, width: 1.4, dash }, hovertemplate: `${name}<br>%{x:.4g} ms: %{y:.4g}<extra></extra>` } as Data;
}

const ms = (t: ArrayLike<number>) => Array.from(t, (v) => v * 1e3);

/** A program (start value and points) as a line in display units. */
function programLine(start: number | null, points: [number, number][], k: number, name: string, colour: string, t0Value: number): Data {
  const x = [0, ...points.map((p) => p[0] * 1e3)];
  const y = [(start ?? t0Value) * k, ...points.map((p) => p[1] * k)];
  return line(x, y, name, colour, 'dash');
}

/** Every plot's traces, keyed by plot id. `mass` is the rest energy [eV] (for the momentum proposal). */
export function cycleTraces(p: CyclePlan, proposal: Proposal | null, mass: number): Record<string, Data[]> {
  const x = ms(p.time);
  const out: Record<string, Data[]> = {};
  out.phis = [line(x, p.phiS, 'φs', INK), line([x[0], x[x.length - 1]], [90, 90], '90°', '#999', 'dot')];
  out.voltage = p.voltage.map((v, k) => line(x, Array.from(v, (u) => u * 1e-3), `system ${k + 1}`, SYSTEM_COLOURS[k % 4]));
  if (proposal?.kind === 'voltage')
    proposal.programs.forEach((pr, k) => out.voltage.push(programLine(pr.start, pr.points, 1e-3, `proposed, system ${k + 1}`, RUST, p.voltage[k][0])));
  out.area = [line(x, p.bucketArea, 'bucket area', INK), line([x[0], x[x.length - 1]], [p.emittance, p.emittance], 'beam emittance', GREEN, 'dash')];
  if (proposal) out.area.push(line([x[0], x[x.length - 1]], [proposal.area, proposal.area], 'target area', RUST, 'dot'));
  out.filling = [line(x, p.filling, 'filling factor', INK)];
  out.height = [line(x, Array.from(p.bucketHalfHeight, (e) => e * 1e-6), 'bucket half-height', INK)];
  out.fs = [line(x, Array.from(p.fs, (f) => f * 1e-3), 'fs', INK)];
  out.adiabaticity = [line(x, p.adiabaticity, 'adiabaticity', INK)];
  out.energy = [line(x, Array.from(p.energy, (e) => (e - mass) * 1e-9), 'kinetic energy', INK)];
  if (proposal?.kind === 'momentum') {
    const pr = proposal.program;
    const kin = (pc: number) => Math.hypot(pc, mass) - mass;
    out.energy.push(programLine(pr.start === null ? null : kin(pr.start), pr.points.map(([t, pc]) => [t, kin(pc)] as [number, number]), 1e-9, 'proposed', RUST, p.energy[0] - mass));
  }
  return out;
}

/** Limit lines drawn on the filling and adiabaticity plots. */
export function limitLine(p: CyclePlan, value: number): Data {
  return line([p.time[0] * 1e3, p.time[p.time.length - 1] * 1e3], [value, value], 'limit', RUST, 'dot');
}
