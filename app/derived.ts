// Physics derived from the valid setup on the main thread: machine state, bucket, separatrix, fixed points and
// tune, memoised on (setup object, run point) so a render never recomputes them. The matched-bunch numbers come
// with the beam from the worker instead: matching takes ~0.1 s, too long for the main thread.
import { computeBucket, dtOfPhase, fixedPoints, separatrix, type BucketInfo } from '../core/bucket.ts';
import { MachineStepper, type MachineState } from '../core/machine.ts';
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

/** Where the tracker is: turn, time since turn 0 [s] and p·c of the synchronous particle [eV]. */
export interface RunPoint {
  turn: number;
  time: number;
  pc: number;
}

// A few recent results: the turn-0 bucket and the bucket at the tracker's turn are asked for alternately.
const CACHE_SIZE = 4;
const cache: { setup: Setup; at: RunPoint | null; view: BucketView }[] = [];
const same = (a: RunPoint | null, b: RunPoint | null) => a === b || (!!a && !!b && a.turn === b.turn && a.pc === b.pc && a.time === b.time);

/** Bucket of a setup at turn 0 (at = null) or where the tracker is (same object for the same inputs). */
export function bucketAt(setup: Setup, at: RunPoint | null): BucketView {
  const hit = cache.find((c) => c.setup === setup && same(c.at, at));
  if (hit) return hit.view;
  const stepper = new MachineStepper(setup);
  // Programs (ramp tables, RF voltage tables, timed slope) depend on time: resume the machine at the run point.
  if (at) stepper.resumeAt(at.turn, at.time, at.pc);
  const view = computeView(stepper.state);
  cache.unshift({ setup, at, view });
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
