// Synchronous phase for any set of RF systems. Units: phases in rad (main-harmonic phase φ), energies in eV.
// Stability (PHYSICS.md §0): a fixed point φ of F(φ)=0 is stable when η·F'(φ) < 0, i.e. on the rising slope
// below transition (η < 0) and on the falling slope above (η > 0). Where F' = 0 (e.g. a flat double-harmonic
// well) the point is stable when the potential has a minimum there (PHYSICS.md §8, step 3).
import { maxHarmonicRatio, rfGain, rfGainIntegral, rfGainSlope, type RfWave } from './rf.ts';

/** Which slope carries the bunch: 'rising' is phase-stable below transition, 'falling' above. */
export type Slope = 'rising' | 'falling';

export type SyncPhase =
  | { ok: true; phiS: number; slope: Slope }
  | { ok: false; reason: string };

// Sampling density: ≥2000 points per main period and ≥50 per period of the highest harmonic (PHYSICS.md §8).
const MIN_SAMPLES = 2000;
const SAMPLES_PER_HARMONIC_PERIOD = 50;

/** Slope that is stable for a given slip-factor sign. */
export function stableSlope(eta: number): Slope {
  return eta < 0 ? 'rising' : 'falling';
}

/** Refine a bracketed root of F on [a, b] by bisection to machine precision (no allocation); fa = F(a). */
export function bisectRoot(w: RfWave, a: number, b: number, fa = rfGain(w, a)): number {
  for (let i = 0; i < 200 && b - a > 1e-15 * (1 + Math.abs(a)); i++) {
    const m = 0.5 * (a + b);
    const fm = rfGain(w, m);
    if (fm === 0) return m;
    if (fa < 0 === fm < 0) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return 0.5 * (a + b);
}

/** True if the root at φ is a stable fixed point for the given slope. */
export function isStable(w: RfWave, phi: number, slope: Slope): boolean {
  const d = rfGainSlope(w, phi);
  let scale = 0;
  for (let k = 0; k < w.ZV.length; k++) scale += Math.abs(w.ZV[k] * w.n[k]);
  if (Math.abs(d) > 1e-9 * scale) return slope === 'rising' ? d > 0 : d < 0;
  // Degenerate slope: stable if ∫F has the right curvature sign, i.e. the potential has a minimum here.
  const eps = 1e-3;
  const sign = slope === 'rising' ? 1 : -1; // U ∝ −sgn(η)∫F and rising ⇔ η < 0
  const uL = sign * rfGainIntegral(w, phi, phi - eps);
  const uR = sign * rfGainIntegral(w, phi, phi + eps);
  return uL > 0 && uR > 0;
}

/**
 * Solve F(φ_s) = 0 on the requested slope. Among several stable roots, pick the one nearest the
 * single-harmonic answer arcsin(ΔE_s/ZV_1) (rising) or π − arcsin(...) (falling).
 */
export function solveSyncPhase(w: RfWave, slope: Slope): SyncPhase {
  if (!(w.ZV[0] > 0)) return { ok: false, reason: 'the main RF system has no voltage' };
  const phiS = findSyncPhase(w, slope);
  if (Number.isNaN(phiS)) {
    const peak = maxGain(w);
    return {
      ok: false,
      reason:
        `no bucket: the synchronous particle needs ${fmt(w.dEs)} eV per turn but the RF gives at most ` +
        `${fmt(peak)} eV on the ${slope} slope`,
    };
  }
  return { ok: true, phiS, slope };
}

/** As solveSyncPhase, without allocating: φs in [−π/2, 3π/2), or NaN when there is no stable phase. */
export function findSyncPhase(w: RfWave, slope: Slope): number {
  storeSyncPhase(w, slope, found);
  return found[0];
}
const found = new Float64Array(1);

/**
 * findSyncPhase into out[0]. For code run once per turn: a number returned from a call the compiler does not
 * inline is boxed (a 16-byte object per turn); one written into a Float64Array is not.
 */
export function storeSyncPhase(w: RfWave, slope: Slope, out: Float64Array): void {
  const ZV1 = w.ZV[0];
  out[0] = NaN;
  if (!(ZV1 > 0)) return;
  const x = Math.max(-1, Math.min(1, w.dEs / ZV1));
  const guess = slope === 'rising' ? Math.asin(x) : Math.PI - Math.asin(x);
  let nmax = 1;
  for (let k = 0; k < w.n.length; k++) nmax = Math.max(nmax, Math.abs(w.n[k])); // maxHarmonicRatio, inline
  const N = Math.max(MIN_SAMPLES, Math.ceil(SAMPLES_PER_HARMONIC_PERIOD * nmax));
  const a0 = guess - Math.PI;
  const step = (2 * Math.PI) / N;
  let best = NaN;
  let bestDist = Infinity;
  let aPrev = a0;
  let fPrev = rfGain(w, a0);
  for (let i = 1; i <= N; i++) {
    const b = a0 + i * step;
    const fb = rfGain(w, b);
    if (fPrev === 0 || fPrev < 0 !== fb < 0) {
      // Bisect from the stored sample (recomputing F at aPrev could flip the sign of a tiny value).
      const root = fPrev === 0 ? aPrev : bisectRoot(w, aPrev, b, fPrev);
      if (isStable(w, root, slope)) {
        const dist = Math.abs(root - guess);
        if (dist < bestDist) {
          bestDist = dist;
          best = root;
        }
      }
    }
    aPrev = b;
    fPrev = fb;
  }
  if (Number.isNaN(best)) return;
  const q = (((best + Math.PI / 2) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI); // wrapSyncPhase, written out:
  out[0] = q - Math.PI / 2; // a call the compiler did not inline boxed its argument and result
}

/** Largest energy gain Z·ΣV_k sin(n_k φ + Φ_k) over one main period [eV] (sampled, then refined). */
export function maxGain(w: RfWave): number {
  const N = Math.max(MIN_SAMPLES, Math.ceil(SAMPLES_PER_HARMONIC_PERIOD * maxHarmonicRatio(w)));
  let m = -Infinity;
  for (let i = 0; i < N; i++) m = Math.max(m, rfGain(w, (2 * Math.PI * i) / N) + w.dEs);
  return m;
}

/** Map φs into [−π/2, 3π/2): rising-slope phases near 0, falling-slope ones near π (stationary above transition: π). */
export function wrapSyncPhase(p: number): number {
  const q = (((p + Math.PI / 2) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
  return q - Math.PI / 2;
}

/** Map a phase into (−π, π]. */
export function wrapPhase(p: number): number {
  let q = p % (2 * Math.PI);
  if (q <= -Math.PI) q += 2 * Math.PI;
  if (q > Math.PI) q -= 2 * Math.PI;
  return q;
}

function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString();
}
