// Relativistic kinematics and slip factor. Units: E (total energy), T (kinetic), pc in eV; times in s; lengths in m.
// Convention: δ = Δp/p_s; time of flight T(δ)/T_s − 1 = η0·δ + η1·δ² (time-of-flight form, see PHYSICS.md §3).
// Sources: S.Y. Lee, Accelerator Physics, 2nd ed. (2004), ch. 2–3; A.W. Chao et al., Handbook of Accelerator
// Physics and Engineering, 2nd ed. (2013).
import { C_LIGHT } from './constants.ts';

export interface Kinematics {
  E: number; // total energy [eV]
  gamma: number;
  beta: number;
  pc: number; // momentum × c [eV]
  T: number; // kinetic energy [eV]
}

/** Kinematics from total energy E and rest energy m (both eV). Uses T = E − m only for display. */
export function fromTotal(E: number, m: number): Kinematics {
  const gamma = E / m;
  const pc = Math.sqrt((E - m) * (E + m));
  return { E, gamma, beta: pc / E, pc, T: E - m };
}

/**
 * √(x² + y²) with the bits of V8's Math.hypot for two arguments (src/builtins/math.tq, MathHypot: both scaled by
 * the larger magnitude, so no overflow or underflow; ±Infinity wins over NaN). Math.hypot is a builtin call that
 * optimizing compilers do not inline: every call boxes its arguments and result, and Node 20's V8 also allocates
 * a scratch array (30–80 bytes of garbage per call, measured in Chromium 156 and Node 20). This one allocates
 * nothing once optimized and gives the same value in every engine. Used for E = √(pc² + m²) on every turn.
 * |x| is written as a comparison: Chromium's mid tier (Maglev) called the Math.abs builtin here, boxing its result.
 * One path and one return: early returns of constants (0, NaN, Infinity) made the inlined result a boxed number
 * (16 bytes per turn in Node 20). max·√(1 + r²) with r = min/max is the same product as √(a² + b²)·max with one of
 * a, b equal to 1; NaN propagates through r (or through max).
 */
export function hypot(x: number, y: number): number {
  const ax = x < 0 ? -x : x, ay = y < 0 ? -y : y; // −0 stays −0, which squares to +0 as |−0| does
  const max = ax > ay ? ax : ay, min = ax > ay ? ay : ax;
  const r = max > 0 ? min / max : min; // max 0 or NaN: r is 0 or NaN
  const h = max * Math.sqrt(1 + r * r) + 0; // + 0: hypot(−0, −0) is +0
  return ax === Infinity || ay === Infinity ? Infinity : h;
}

/** Kinematics from momentum × c [eV]. */
export function fromMomentum(pc: number, m: number): Kinematics {
  const E = hypot(pc, m);
  return { E, gamma: E / m, beta: pc / E, pc, T: E - m };
}

/** Kinematics from kinetic energy [eV] (whole particle, not per nucleon). */
export function fromKinetic(T: number, m: number): Kinematics {
  const E = T + m;
  const pc = Math.sqrt(T * (T + 2 * m)); // no cancellation at low T
  return { E, gamma: E / m, beta: pc / E, pc, T };
}

/** Magnetic rigidity Bρ [T·m] from pc [eV] and charge state Z. */
export function rigidity(pc: number, Z: number): number {
  return pc / (Math.abs(Z) * C_LIGHT);
}

export interface Compaction {
  alpha0: number;
  alpha1: number;
  alpha2: number;
}

/** First-order slip factor η0 = α0 − 1/γ². */
export function eta0(c: Compaction, gamma: number): number {
  return c.alpha0 - 1 / (gamma * gamma);
}

/** Second-order slip factor, time-of-flight form: η1 = α1 − η0/γ² + 3β²/(2γ²) (PHYSICS.md §3). */
export function eta1(c: Compaction, gamma: number, beta: number): number {
  const g2 = gamma * gamma;
  return c.alpha1 - eta0(c, gamma) / g2 + (1.5 * beta * beta) / g2;
}

/**
 * Exact relative time of flight T(E_s+dE)/T_s − 1, evaluated without cancellation (PHYSICS.md §3):
 * ε = dE/E_s, u = (2ε+ε²)/β_s², δ = u/(1+√(1+u)),
 * T/T_s − 1 = [(1+ε)(α0δ+α1δ²+α2δ³) − (2ε+ε²)/(β_s²γ_s²(2+ε+δ))]/(1+δ).
 */
export function relativeTimeOfFlight(dE: number, Es: number, beta: number, gamma: number, c: Compaction): number {
  const eps = dE / Es;
  const b2 = beta * beta;
  const w = 2 * eps + eps * eps;
  const u = w / b2;
  const delta = u / (1 + Math.sqrt(1 + u));
  const path = delta * (c.alpha0 + delta * (c.alpha1 + delta * c.alpha2));
  return ((1 + eps) * path - w / (b2 * gamma * gamma * (2 + eps + delta))) / (1 + delta);
}

/** Relative momentum offset δ from an energy offset, exact: δ = √(1+u) − 1 with u as above. */
export function deltaFromDE(dE: number, Es: number, beta: number): number {
  const eps = dE / Es;
  const u = (2 * eps + eps * eps) / (beta * beta);
  return u / (1 + Math.sqrt(1 + u));
}
