// Smooth ramp shapes. Units: time in s; the value carries the unit of its quantity (see quantity.ts).
// Parabolic–linear–parabolic ramp (common practice for magnet ramps: the rate, and so the RF energy gain per
// turn, rises linearly from zero instead of jumping): from v0 at `start` to v1 at `start + duration`, with
// constant second derivative a during the first and last `rounding` seconds and constant slope in between.
// Continuity of v and dv/dt fixes a = (v1 − v0)/(τ·(T − τ)), τ = rounding, T = duration (τ ≤ T/2): the linear
// part has slope a·τ = (v1 − v0)/(T − τ).
import type { Program } from './table.ts';

/** Parameters of a parabolic–linear–parabolic ramp. */
export interface SmoothRamp {
  v0: number;
  v1: number;
  /** Time the ramp starts [s] (flat bottom before). */
  start: number;
  /** Ramp duration [s], from leaving v0 to reaching v1. */
  duration: number;
  /** Duration of each parabolic part [s], 0 … duration/2 (0: a linear ramp with corners). */
  rounding: number;
}

/** Program of a parabolic–linear–parabolic ramp; throws a RangeError naming the bad parameter. */
export function smoothRamp(r: SmoothRamp): Program {
  const { v0, v1, start, duration: T, rounding: tau } = r;
  if (!(T > 0 && Number.isFinite(T))) throw new RangeError(`ramp duration = ${T} s: must be a finite number > 0`);
  if (!(start >= 0 && Number.isFinite(start))) throw new RangeError(`ramp start = ${start} s: must be a finite number ≥ 0`);
  if (!(tau >= 0 && tau <= T / 2)) throw new RangeError(`ramp rounding = ${tau} s: must be in [0, ${T / 2}] s (half the duration)`);
  const dv = v1 - v0;
  // Slope of the linear part; the parabolic parts use a = slope/τ, written so a tiny τ cannot overflow.
  const slope = dv / (T - tau);
  const end = start + T;
  return {
    end,
    at(time: number): number {
      const x = time - start;
      if (!(x > 0)) return v0;
      if (x >= T) return v1;
      if (x < tau) return v0 + 0.5 * slope * (x / tau) * x;
      const y = T - x;
      if (y < tau) return v1 - 0.5 * slope * (y / tau) * y;
      return v0 + 0.5 * slope * tau + slope * (x - tau);
    },
  };
}

/** Largest rate dv/dt of the ramp [unit/s] (the linear part). */
export function smoothRampMaxRate(r: SmoothRamp): number {
  return r.rounding > 0 ? (r.v1 - r.v0) / (r.duration - r.rounding) : (r.v1 - r.v0) / r.duration;
}
