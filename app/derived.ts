// Physics derived from the valid setup on the main thread: machine state, bucket, separatrix, fixed points and
// tune, memoised on (setup object, energy) so a render never recomputes them. The matched-bunch numbers come
// with the beam from the worker instead: matching takes ~0.1 s, too long for the main thread.
import { computeBucket, dtOfPhase, fixedPoints, separatrix, type BucketInfo } from '../core/bucket.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import type { Setup } from '../core/setup/schema.ts';
import { smallAmplitudeTune } from '../core/synchrotron.ts';

/** The bucket as the views need it, at one synchronous energy. */
export interface BucketView {
  m: MachineState;
  bucket: BucketInfo | null;
  /** Why there is no bucket, or null. */
  reason: string | null;
  /** Closed separatrix curve (dt in s, dE in eV). */
  sep: { dt: Float64Array; dE: Float64Array } | null;
  /** Fixed points as time offsets [s] within one RF period of the bucket. */
  stableDt: number[];
  unstableDt: number[];
  Qs: number;
  fs: number;
}

/** The setup moved to another synchronous energy (total, eV): the machine at a later turn of the same program. */
export function atEnergy(setup: Setup, Es: number): Setup {
  return { ...setup, energy: { ...setup.energy, start: { quantity: 'total', value: Es } } };
}

// A few recent results: the turn-0 bucket and the bucket at the tracker's energy are asked for alternately.
const CACHE_SIZE = 4;
const cache: { setup: Setup; Es: number | null; view: BucketView }[] = [];

/** Bucket of a setup at turn 0 (Es null) or at a given synchronous energy (same object for the same inputs). */
export function bucketAt(setup: Setup, Es: number | null): BucketView {
  const hit = cache.find((c) => c.setup === setup && c.Es === Es);
  if (hit) return hit.view;
  const view = computeView(machineAtStart(Es === null ? setup : atEnergy(setup, Es)));
  cache.unshift({ setup, Es, view });
  if (cache.length > CACHE_SIZE) cache.pop();
  return view;
}

function computeView(m: MachineState): BucketView {
  const empty = { m, bucket: null, sep: null, stableDt: [], unstableDt: [], Qs: NaN, fs: NaN };
  if (m.noBucket) return { ...empty, reason: m.noBucket };
  const br = computeBucket(m);
  const tune = smallAmplitudeTune(m);
  if (!br.ok) return { ...empty, reason: br.reason, Qs: tune.Qs, fs: tune.fs };
  const b = br.bucket;
  const fp = fixedPoints(m);
  // Keep the fixed points that belong to the drawn bucket (one RF period around it).
  const lo = b.phiLeft - 1e-9, hi = b.phiRight + 1e-9;
  // Fixed points repeat every 2π of the main phase; both ends of a stationary bucket are the same point.
  const near = (phis: number[]) =>
    phis.flatMap((p) => [p - 2 * Math.PI, p, p + 2 * Math.PI]).filter((p) => p >= lo && p <= hi).map((p) => dtOfPhase(m, p));
  return {
    m, bucket: b, reason: null, sep: separatrix(m, b, 400),
    stableDt: near(fp.stable), unstableDt: near(fp.unstable), Qs: tune.Qs, fs: tune.fs,
  };
}
