// Synchrotron tune: small-amplitude (linear) value and its dependence on amplitude, for any set of RF systems.
// Units: tunes per turn (dimensionless), frequencies in Hz, phases in rad (main harmonic), energies in eV.
// Per turn n (PHYSICS.md §4–5): dφ/dn = 2π·h·η·δ and dδ/dn = F(φ)/(β²E), so with H' = π·h·|η|·δ² + U(φ) the period of
// the orbit at level H is T_s = ∮dφ/|φ̇| = ∫_{φmin}^{φmax} dφ / sqrt(π·h·|η|·(H − U(φ))) turns, and Q = 1/T_s.
import type { BucketInfo } from './bucket.ts';
import type { MachineState } from './machine.ts';
import { rfGain, rfGainSlope } from './rf.ts';
import { tanhSinh } from './bucket/quadrature.ts';
import { levelCrossing, refineStable, wellDrop, wellOf, wellU, type Well } from './bucket/well.ts';

// Below this fraction of Σ|Z·V_k·n_k| the slope F'(φs) counts as zero (flat, quartic well); same threshold as
// the stability test in synchronous.ts.
const FLAT_SLOPE = 1e-9;

/** Small-amplitude synchrotron tune Qs = sqrt(h|η||F'(φs)|/(2πβ²E)), frequency fs = Qs·f0 [Hz], and the tune of the discrete one-turn map (cos 2πQ = 1 − 2(πQs)²). */
export function smallAmplitudeTune(m: MachineState): { Qs: number; fs: number; QsMap: number } {
  const w = m.wave;
  if (!Number.isFinite(m.phiS) || !(m.eta0 !== 0 && Number.isFinite(m.eta0))) return { Qs: NaN, fs: NaN, QsMap: NaN };
  // Evaluate at the true minimum of U: m.phiS may sit up to one search step off it.
  const slope = rfGainSlope(w, refineStable(wellOf(m), m.phiS));
  let scale = 0;
  for (let k = 0; k < w.ZV.length; k++) scale += Math.abs(w.ZV[k] * w.n[k]);
  // η·F' > 0 would be an unstable point: no tune (PHYSICS.md §0).
  if (m.eta0 * slope > 0 && Math.abs(slope) > FLAT_SLOPE * scale) return { Qs: NaN, fs: NaN, QsMap: NaN };
  const Fp = Math.abs(slope) <= FLAT_SLOPE * scale ? 0 : Math.abs(slope);
  const Qs = Math.sqrt((m.h * Math.abs(m.eta0) * Fp) / (2 * Math.PI * m.beta * m.beta * m.Es));
  // cos 2πQ = 1 − 2(πQs)² ⇔ sin πQ = πQs; the arcsine form keeps full precision for small Qs.
  const QsMap = Math.PI * Qs <= 1 ? Math.asin(Math.PI * Qs) / Math.PI : NaN;
  return { Qs, fs: Qs * m.f0, QsMap };
}

/** Synchrotron tune of the orbit whose largest phase reaches φs + amp (amp > 0, rad); NaN for orbits outside the bucket. */
export function tuneAtAmplitude(m: MachineState, b: BucketInfo, amp: number): number {
  if (!(amp > 0 && Number.isFinite(amp)))
    throw new RangeError(`synchrotron amplitude amp = ${amp} rad: must be a finite number > 0`);
  return tuneOf(wellOf(m), b, amp);
}

/** Vector form for plotting: tunes at each amplitude. */
export function tuneVsAmplitude(m: MachineState, b: BucketInfo, amps: ArrayLike<number>): Float64Array {
  const q = wellOf(m);
  const out = new Float64Array(amps.length);
  for (let i = 0; i < amps.length; i++) {
    const a = amps[i];
    if (!(a > 0 && Number.isFinite(a)))
      throw new RangeError(`synchrotron amplitude amps[${i}] = ${a} rad: must be a finite number > 0`);
    out[i] = tuneOf(q, b, a);
  }
  return out;
}

function tuneOf(q: Well, b: BucketInfo, amp: number): number {
  const phiMax = b.phiS + amp;
  if (phiMax >= b.phiRight) return NaN;
  const H = wellU(q, phiMax);
  if (!(H > wellU(q, b.phiS) && H < b.Usep)) return NaN;
  // φmax must be a right turning point: U rising there (U' = −sgn(η)·F/(β²E) > 0).
  if (!(-q.sgn * rfGain(q.w, phiMax) > 0)) return NaN;
  const phiMin = levelCrossing(q, phiMax, -1, H, phiMax - b.phiLeft);
  if (Number.isNaN(phiMin)) return NaN;
  // H − U as the drop from the nearer turning point keeps the 1/sqrt endpoints accurate.
  const f = (d: number, right: boolean): number => 1 / Math.sqrt(right ? wellDrop(q, phiMax, -d) : wellDrop(q, phiMin, d));
  const turns = tanhSinh(f, phiMin, phiMax) / Math.sqrt(q.kappa);
  return 1 / turns;
}
