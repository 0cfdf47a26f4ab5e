// The potential well U(φ) of one machine state, with the searches the bucket code needs.
// Units: φ main-harmonic phase [rad]; U and H' per turn, dimensionless (PHYSICS.md §5):
// H'(φ, δ) = π·h·|η|·δ² + U(φ), U(φ) = −sgn(η)·(β²E)⁻¹·∫_{φs}^{φ} F dφ', so wells are minima of U for either sign
// of η and U(φs) = 0. Along increasing φ, U' = −sgn(η)·F/(β²E).
import type { MachineState } from '../machine.ts';
import { maxHarmonicRatio, rfGain, type RfWave } from '../rf.ts';
import { bisectRoot } from '../synchronous.ts';

// Sampling density for root and level searches: ≥2000 per main period, ≥50 per period of the highest harmonic
// (PHYSICS.md §8, step 1).
const MIN_SAMPLES = 2000;
const SAMPLES_PER_HARMONIC_PERIOD = 50;

export interface Well {
  readonly w: RfWave;
  readonly phiS: number;
  /** Sign of the slip factor η (±1). */
  readonly sgn: number;
  /** β²E_s [eV]. */
  readonly b2E: number;
  /** π·h·|η|: H' = kappa·δ² + U. */
  readonly kappa: number;
  /** Grid step [rad] for searches. */
  readonly step: number;
}

/** The well of a machine state (η must be non-zero and finite; the caller checks). */
export function wellOf(m: MachineState): Well {
  const N = Math.max(MIN_SAMPLES, Math.ceil(SAMPLES_PER_HARMONIC_PERIOD * maxHarmonicRatio(m.wave)));
  return {
    w: m.wave,
    phiS: m.phiS,
    sgn: Math.sign(m.eta0),
    b2E: m.beta * m.beta * m.Es,
    kappa: Math.PI * m.h * Math.abs(m.eta0),
    step: (2 * Math.PI) / N,
  };
}

/** U(φ) per turn; the product form keeps relative precision ~1e-16/|φ − φs| near the well bottom (cos differences give 1e-16/|φ − φs|²). */
export function wellU(q: Well, phi: number): number {
  return -wellDrop(q, q.phiS, phi - q.phiS);
}

/** U(e) − U(e + d), accurate for small d: cos A − cos B written as a product of sines. */
export function wellDrop(q: Well, e: number, d: number): number {
  const w = q.w;
  let s = -w.dEs * d; // ∫_e^{e+d} F dφ
  for (let k = 0; k < w.ZV.length; k++) {
    const n = w.n[k];
    s += ((2 * w.ZV[k]) / n) * Math.sin(n * (e + 0.5 * d) + w.offset[k]) * Math.sin(0.5 * n * d);
  }
  return (q.sgn * s) / q.b2E;
}

/** Refine φ in [a, b] (either order) where U crosses `level`, given U(a) < level ≤ U(b). */
export function bisectLevel(q: Well, a: number, b: number, level: number): number {
  for (let i = 0; i < 200 && Math.abs(b - a) > 1e-15 * (1 + Math.abs(a)); i++) {
    const m = 0.5 * (a + b);
    if (wellU(q, m) < level) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

/** First φ beyond `from` in direction dir (±1) where U reaches `level`, within maxDist [rad]; NaN if none. */
export function levelCrossing(q: Well, from: number, dir: number, level: number, maxDist: number): number {
  const n = Math.ceil(maxDist / q.step);
  const h = maxDist / Math.max(n, 1);
  let prev = from;
  for (let i = 1; i <= n; i++) {
    const phi = from + dir * i * h;
    if (wellU(q, phi) >= level) return bisectLevel(q, prev, phi, level);
    prev = phi;
  }
  return NaN;
}

export interface Extremum {
  phi: number;
  U: number;
  kind: 'min' | 'max';
}

/** Extrema of U on [a, b] from sign changes of F on a grid of `n` intervals (default: the search step), refined, in increasing φ. */
export function scanExtrema(q: Well, a: number, b: number, n = Math.ceil((b - a) / q.step)): Extremum[] {
  const h = (b - a) / n;
  const out: Extremum[] = [];
  let xPrev = a;
  let fPrev = rfGain(q.w, a);
  for (let i = 1; i <= n; i++) {
    const x = a + i * h;
    const f = rfGain(q.w, x);
    if (fPrev < 0 !== f < 0) {
      const phi = bisectRoot(q.w, xPrev, x, fPrev);
      // F rising means U' goes from −sgn to +sgn: a minimum below transition (sgn < 0), a maximum above.
      const rising = fPrev < 0;
      out.push({ phi, U: wellU(q, phi), kind: rising === q.sgn < 0 ? 'min' : 'max' });
    }
    xPrev = x;
    fPrev = f;
  }
  return out;
}

/** The stable fixed point nearest φ0 within two search steps (φ0 itself if none is resolved there). */
export function refineStable(q: Well, phi0: number): number {
  let best = phi0;
  for (const e of scanExtrema(q, phi0 - 2 * q.step, phi0 + 2 * q.step, 64))
    if (e.kind === 'min' && (best === phi0 || Math.abs(e.phi - phi0) < Math.abs(best - phi0))) best = e.phi;
  return best;
}
