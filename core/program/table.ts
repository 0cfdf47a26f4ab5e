// Programs: a quantity against time, v(t). Units: time in s; the value carries the unit of its quantity
// (eV, T, V or deg; see quantity.ts). Piecewise-linear tables start at (0, v0), the value at t = 0 given by the
// setup's static field (energy.start, rf.systems[k].voltage or .phase); the last value is held after the last
// point. Two points at the same time make a step: the first value holds before that time, the second from it on.
// Lookup moves an index along the table (O(1) per turn when time advances), never searching from the start.

/** A value against time [s]; `end` is the time after which the value no longer changes. */
export interface Program {
  at(time: number): number;
  readonly end: number;
}

/** A table point: [time (s), value]. */
export type ProgramPoint = readonly [number, number];

/** Piecewise-linear program through (0, v0) and `points` (times > 0, non-decreasing; a repeated time is a step). */
export class TableProgram implements Program {
  readonly t: Float64Array;
  readonly v: Float64Array;
  private i = 0; // current segment: t[i] ≤ time < t[i+1]

  constructor(v0: number, points: readonly ProgramPoint[]) {
    const problem = tableProblem(points);
    if (problem) throw new RangeError(problem);
    const n = points.length + 1;
    this.t = new Float64Array(n);
    this.v = new Float64Array(n);
    this.v[0] = v0;
    for (let k = 1; k < n; k++) {
      this.t[k] = points[k - 1][0];
      this.v[k] = points[k - 1][1];
    }
  }

  get end(): number {
    return this.t[this.t.length - 1];
  }

  /** Value at `time` [s]; before 0 the first value, after the end the last. */
  at(time: number): number {
    const t = this.t, v = this.v, last = t.length - 1;
    if (!(time > 0)) return v[0];
    if (time >= t[last]) return v[last];
    let i = this.i;
    while (i > 0 && time < t[i]) i--; // rare: a step back in time (resumed run)
    while (i < last - 1 && time >= t[i + 1]) i++;
    this.i = i;
    const dt = t[i + 1] - t[i];
    return dt > 0 ? v[i] + ((v[i + 1] - v[i]) * (time - t[i])) / dt : v[i + 1];
  }
}

/** Why a list of points is not a valid table, or null: times finite, > 0, non-decreasing, at most two at one time. */
export function tableProblem(points: readonly ProgramPoint[]): string | null {
  let prev = 0;
  let same = 0;
  for (let k = 0; k < points.length; k++) {
    const [t, v] = points[k];
    if (!Number.isFinite(t) || !Number.isFinite(v)) return `point ${k}: time and value must be finite numbers, got [${t}, ${v}]`;
    if (!(t > 0)) return `point ${k}: time ${t} s must be > 0 (the value at t = 0 is the setup's static value)`;
    if (t < prev) return `point ${k}: time ${t} s is earlier than the point before (${prev} s); times must not decrease`;
    same = t === prev ? same + 1 : 0;
    if (same > 1) return `point ${k}: three points at t = ${t} s; a step takes exactly two`;
    prev = t;
  }
  return null;
}

/** Sample any program at n + 1 evenly spaced times over [0, tEnd] (for plots and for turning shapes into tables). */
export function sampleProgram(p: Program, tEnd: number, n: number): { t: Float64Array; v: Float64Array } {
  if (!(n >= 1 && Number.isInteger(n))) throw new RangeError(`samples n = ${n}: must be an integer ≥ 1`);
  if (!(tEnd > 0 && Number.isFinite(tEnd))) throw new RangeError(`end time ${tEnd} s: must be a finite number > 0`);
  const t = new Float64Array(n + 1);
  const v = new Float64Array(n + 1);
  for (let k = 0; k <= n; k++) {
    t[k] = (tEnd * k) / n;
    v[k] = p.at(t[k]);
  }
  return { t, v };
}
