// RF bucket geometry for any set of RF systems: fixed points, separatrix, area, height, length, sub-buckets.
// Units: φ main-harmonic phase [rad], dt [s], dE [eV], areas [eV·s]; δ = dE/(β²E_s).
// Convention (PHYSICS.md §0, §5): φ = φ_s + ω_rf·dt (dt > 0 late), H'(φ, δ) = π·h·|η|·δ² + U(φ) per turn, with U from
// rf.ts; wells are minima of U for either sign of η. Areas in (φ, δ) convert to eV·s by β²E/ω_rf (PHYSICS.md §5).
// The outer bucket of φ_s is bounded, on each side, by the highest U maximum within one main period; U_sep is the
// lower of the two (PHYSICS.md §8, step 4). Lower maxima inside are inner humps: they split the bucket into
// sub-buckets, each bounded by its nearest maxima.
import { wrapPhase, isStable, stableSlope } from './synchronous.ts';
import type { MachineState } from './machine.ts';
import { potential } from './rf.ts';
import { tanhSinh } from './bucket/quadrature.ts';
import { levelCrossing, refineStable, scanExtrema, wellDrop, wellOf, wellU, type Extremum, type Well } from './bucket/well.ts';

/** An inner well of a multi-harmonic bucket, bounded by its nearest U maxima at the lower of their levels. */
export interface SubBucket {
  phiS: number; // its U minimum [rad]
  phiLeft: number; // ends of its separatrix [rad]
  phiRight: number;
  area: number; // [eV·s]
}

/** Geometry of the bucket around the synchronous phase. U has its origin at m.phiS (as in hamiltonian()). */
export interface BucketInfo {
  phiS: number; // stable fixed point (true U minimum nearest m.phiS), main-harmonic phase [rad]
  phiLeft: number; // bucket ends [rad]: where the separatrix closes (U = Usep), phiLeft < phiS < phiRight
  phiRight: number;
  unstable: number[]; // unstable fixed points (U maxima) bounding this bucket [rad]
  Usep: number; // value of H' on the separatrix
  area: number; // [eV·s]
  halfHeightDE: number; // max dE on the separatrix [eV]
  halfHeightDelta: number; // the same as δ = dE/(β²E)
  length: number; // (phiRight − phiLeft)/ω_rf [s]
  subBuckets: SubBucket[]; // inner wells inside this bucket (multi-harmonic), empty if none
}

/** Either the bucket or the plain reason there is none. */
export type BucketResult = { ok: true; bucket: BucketInfo } | { ok: false; reason: string };

const TWO_PI = 2 * Math.PI;
// Two U maxima count as one level when they agree to this fraction of the well depth (round-off of cos sums).
const LEVEL_TIE = 1e-9;

/** Bucket around m.phiS; ok:false with a plain reason when m.noBucket or no closed separatrix. */
export function computeBucket(m: MachineState): BucketResult {
  if (m.noBucket) return { ok: false, reason: m.noBucket };
  const bad = wellProblem(m);
  if (bad) return { ok: false, reason: bad };
  if (!isStable(m.wave, m.phiS, stableSlope(m.eta0)))
    return { ok: false, reason: `no bucket: φs = ${deg(m.phiS)}° is not a stable fixed point for η = ${m.eta0.toPrecision(4)} (the ${m.slope} slope is stable only ${m.slope === 'rising' ? 'below' : 'above'} transition)` };
  const q = wellOf(m);
  // The bucket centre is the true minimum of U near m.phiS (m.phiS may sit up to a grid step off it); U keeps its
  // origin at m.phiS so that hamiltonian(m, …) and Usep share one reference.
  const phiS = refineStable(q, m.phiS);
  const U0 = wellU(q, phiS);
  const same = 0.5 * q.step; // an extremum this close to φs is φs itself
  const ext = scanExtrema(q, phiS - TWO_PI, phiS + TWO_PI).filter((e) => Math.abs(e.phi - phiS) > same);
  const left = highestMax(ext, (e) => e.phi < phiS);
  const right = highestMax(ext, (e) => e.phi > phiS);
  if (!left && !right) return { ok: false, reason: 'no closed separatrix: U has no maximum within 360° of φs' };
  const Usep = Math.min(left ? left.U : Infinity, right ? right.U : Infinity);
  if (!(Usep > U0)) return { ok: false, reason: 'no closed separatrix: the well around φs has no depth' };
  const tie = LEVEL_TIE * (Usep - U0);
  const phiLeft = left && left.U <= Usep + tie ? left.phi : levelCrossing(q, phiS, -1, Usep, TWO_PI);
  const phiRight = right && right.U <= Usep + tie ? right.phi : levelCrossing(q, phiS, 1, Usep, TWO_PI);
  if (Number.isNaN(phiLeft) || Number.isNaN(phiRight))
    return { ok: false, reason: `no closed separatrix: U does not return to U_sep on the ${Number.isNaN(phiLeft) ? 'left' : 'right'} within 360° of φs` };
  const unstable: number[] = [];
  if (left && left.phi === phiLeft) unstable.push(phiLeft);
  if (right && right.phi === phiRight) unstable.push(phiRight);

  const inside = ext.filter((e) => e.phi > phiLeft + same && e.phi < phiRight - same);
  const minima = inside.filter((e) => e.kind === 'min');
  minima.push({ phi: phiS, U: U0, kind: 'min' });
  minima.sort((a, b) => a.phi - b.phi);
  const Umin = Math.min(...minima.map((e) => e.U));
  const toEVs = q.b2E / m.omegaRf;
  const hMax = Math.sqrt((Usep - Umin) / q.kappa);
  const bucket: BucketInfo = {
    phiS, phiLeft, phiRight, unstable, Usep,
    area: contourArea(q, phiLeft, phiRight) * toEVs,
    halfHeightDE: hMax * q.b2E,
    halfHeightDelta: hMax,
    length: (phiRight - phiLeft) / m.omegaRf,
    subBuckets: minima.length > 1 ? subBuckets(q, inside, minima, phiLeft, phiRight, Usep, toEVs) : [],
  };
  return { ok: true, bucket };
}

/** H'(φ, δ) per turn. */
export function hamiltonian(m: MachineState, phi: number, delta: number): number {
  // U has its origin at m.phiS (U(m.phiS) = 0), the same reference as BucketInfo.Usep.
  const u = potential(m.wave, m.phiS, phi, m.eta0, m.beta * m.beta * m.Es);
  return Math.PI * m.h * Math.abs(m.eta0) * delta * delta + u;
}

/** Main-harmonic phase of a time offset, and back. */
export function phaseOfDt(m: MachineState, dt: number): number {
  return m.phiS + m.omegaRf * dt;
}

/** Time offset [s] of a main-harmonic phase [rad]. */
export function dtOfPhase(m: MachineState, phi: number): number {
  return (phi - m.phiS) / m.omegaRf;
}

/** Closed separatrix curve for plotting, in dt [s] and dE [eV]: upper branch left→right then lower branch right→left, closed (first point repeated at the end). */
export function separatrix(m: MachineState, b: BucketInfo, points = 256): { dt: Float64Array; dE: Float64Array } {
  if (!Number.isInteger(points) || points < 3 || points > 1e6)
    throw new RangeError(`separatrix points = ${points}: must be an integer in [3, 1000000]`);
  const q = wellOf(m);
  const n = points;
  const dt = new Float64Array(2 * n - 1);
  const dE = new Float64Array(2 * n - 1);
  const mid = 0.5 * (b.phiLeft + b.phiRight);
  const r = 0.5 * (b.phiRight - b.phiLeft);
  for (let i = 0; i < n; i++) {
    // Cosine spacing crowds points at the ends, where the curve turns vertical.
    const phi = i === 0 ? b.phiLeft : i === n - 1 ? b.phiRight : mid - r * Math.cos((Math.PI * i) / (n - 1));
    const e = i === 0 || i === n - 1 ? 0 : q.b2E * Math.sqrt(Math.max(0, b.Usep - wellU(q, phi)) / q.kappa);
    dt[i] = dtOfPhase(m, phi);
    dE[i] = e;
    dt[2 * n - 2 - i] = dt[i];
    dE[2 * n - 2 - i] = -e;
  }
  dE[2 * n - 2] = 0;
  return { dt, dE };
}

/** The closed H'-contour at level H inside bucket b (Usep > H > U(phiS)): its phase extent, full length [s], area [eV·s], half-height [eV]. Throws a clear error if H is outside (U(phiS), Usep]. */
export function contourAt(m: MachineState, b: BucketInfo, H: number): { phiMin: number; phiMax: number; length: number; area: number; halfHeightDE: number } {
  const q = wellOf(m);
  const U0 = wellU(q, b.phiS);
  if (!(H > U0 && H <= b.Usep))
    throw new RangeError(`contour level H = ${H}: must be in (U(φs), U_sep] = (${U0}, ${b.Usep}] for this bucket`);
  if (b.Usep - H <= LEVEL_TIE * (b.Usep - U0))
    return { phiMin: b.phiLeft, phiMax: b.phiRight, length: b.length, area: b.area, halfHeightDE: b.halfHeightDE };
  const phiMin = levelCrossing(q, b.phiS, -1, H, b.phiS - b.phiLeft + q.step);
  const phiMax = levelCrossing(q, b.phiS, 1, H, b.phiRight - b.phiS + q.step);
  let Umin = U0;
  for (const s of b.subBuckets) if (s.phiS > phiMin && s.phiS < phiMax) Umin = Math.min(Umin, wellU(q, s.phiS));
  return {
    phiMin, phiMax,
    length: (phiMax - phiMin) / m.omegaRf,
    area: (contourArea(q, phiMin, phiMax) * q.b2E) / m.omegaRf,
    halfHeightDE: q.b2E * Math.sqrt((H - Umin) / q.kappa),
  };
}

/** All fixed points over one main period: stable and unstable phases [rad]. */
export function fixedPoints(m: MachineState): { stable: number[]; unstable: number[] } {
  const stable: number[] = [];
  const unstable: number[] = [];
  if (!(m.eta0 !== 0 && Number.isFinite(m.eta0))) return { stable, unstable };
  const c = Number.isFinite(m.phiS) ? m.phiS : 0;
  const q = wellOf({ ...m, phiS: c });
  // Scan a little beyond one period so a root on the window edge is bracketed, then merge wrapped duplicates.
  for (const e of scanExtrema(q, c - Math.PI - q.step, c + Math.PI + q.step)) {
    const list = e.kind === 'min' ? stable : unstable;
    const p = wrapPhase(e.phi);
    if (!list.some((x) => Math.abs(wrapPhase(x - p)) < 1e-9)) list.push(p);
  }
  stable.sort((a, b) => a - b);
  unstable.sort((a, b) => a - b);
  return { stable, unstable };
}

// Area in (φ, δ) [rad] enclosed by the contour through U(a) = U(b) = H over [a, b]: 2∫ sqrt((H − U)/κ) dφ.
// H − U is taken as the drop from the nearer end, so the sqrt endpoints keep full precision.
function contourArea(q: Well, a: number, b: number): number {
  const f = (d: number, right: boolean): number => Math.sqrt(Math.max(0, right ? wellDrop(q, b, -d) : wellDrop(q, a, d)));
  return (2 / Math.sqrt(q.kappa)) * tanhSinh(f, a, b);
}

// Sub-buckets: each minimum is bounded by its nearest inner maxima (or the outer ends), at the lower level.
function subBuckets(q: Well, inside: Extremum[], minima: Extremum[], L: number, R: number, Usep: number, toEVs: number): SubBucket[] {
  const maxima = inside.filter((e) => e.kind === 'max');
  return minima.map((mn) => {
    let lo: Extremum | undefined;
    let hi: Extremum | undefined;
    for (const x of maxima) {
      if (x.phi < mn.phi && (!lo || x.phi > lo.phi)) lo = x;
      if (x.phi > mn.phi && (!hi || x.phi < hi.phi)) hi = x;
    }
    const level = Math.min(lo ? lo.U : Usep, hi ? hi.U : Usep);
    const tie = LEVEL_TIE * Math.abs(level);
    const loEnd = lo ? lo.phi : L;
    const hiEnd = hi ? hi.phi : R;
    const left = (lo ? lo.U : Usep) <= level + tie ? loEnd : levelCrossing(q, mn.phi, -1, level, mn.phi - loEnd);
    const right = (hi ? hi.U : Usep) <= level + tie ? hiEnd : levelCrossing(q, mn.phi, 1, level, hiEnd - mn.phi);
    const area = contourArea(q, left, right) * toEVs;
    return { phiS: mn.phi, phiLeft: left, phiRight: right, area };
  });
}

// Why this state has no well to speak of, or null.
function wellProblem(m: MachineState): string | null {
  if (!Number.isFinite(m.phiS)) return 'no bucket: no stable synchronous phase';
  if (!(m.eta0 !== 0 && Number.isFinite(m.eta0)))
    return `no bucket: slip factor η = ${m.eta0} (at transition there is no phase focusing)`;
  return null;
}

function highestMax(ext: Extremum[], side: (e: Extremum) => boolean): Extremum | undefined {
  let best: Extremum | undefined;
  for (const e of ext) if (e.kind === 'max' && side(e) && (!best || e.U > best.U)) best = e;
  return best;
}

function deg(x: number): string {
  return Number(((x * 180) / Math.PI).toPrecision(6)).toString();
}
