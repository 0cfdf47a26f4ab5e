// Beam of a setup at its machine state (turn 0): matched, unmatched or coasting, plus the centroid offsets.
// Units: dt in s (dt > 0 late), dE in eV.
// Matched bunches are functions of the continuous H' (PHYSICS.md §5, §9). The tracker's turn is a kick at the gap
// followed by a full-turn drift (PHYSICS.md §4); for that map the invariant ellipse seen at the gap is the
// upright one sheared by half a drift, with tilt α = −tan(πQs) (derived for the linear map: M = D·K =
// D½·(D½·K·D½)·D½⁻¹, and the symmetric middle factor has α = 0). An upright bunch would beat with relative
// amplitude ≈ πQs/2 in rms length; so, with a single gap, the matched bunch gets dt += ½·T0·η0·dE/(β²E).
// The shear keeps the area and the rms emittance, and changes the rms length by ≈ (πQs)²/2 only.
import { makeBunch, type Bunch } from '../bunch.ts';
import { computeBucket } from '../bucket.ts';
import type { MachineState } from '../machine.ts';
import { makeRng } from '../rng.ts';
import type { Setup } from '../setup/schema.ts';
import { generateSelfConsistentBeam } from '../collective/selfConsistent.ts';
import { sampleCoasting } from './coasting.ts';
import { matchBunch, sampleMatched, type MatchedInfo } from './matched.ts';
import { linearlyMatchedSpread, sampleUnmatched } from './unmatched.ts';

/** Generate the beam of a setup at its machine state (turn 0): returns the bunch and, for matched beams, the matched numbers. Throws Error with a clear message naming the field on impossible requests. */
export function generateBeam(setup: Setup, m: MachineState): { bunch: Bunch; matched: MatchedInfo | null } {
  const beam = setup.beam;
  const d = beam.distribution;
  const bunch = makeBunch(beam.particles);
  const rng = makeRng(beam.seed);
  let matched: MatchedInfo | null = null;
  if (d.kind === 'matched') {
    const r = computeBucket(m);
    if (!r.ok) throw new Error(`beam.distribution.kind = matched: ${r.reason}; use a coasting beam instead`);
    matched = matchBunch(m, r.bucket, d.shape, d.size);
    // With intensity and impedances: the self-consistent bunch in the well with its own field (matched stays the
    // zero-intensity reference of the size request).
    if (!generateSelfConsistentBeam(setup, m, bunch)) sampleMatched(m, r.bucket, d.shape, matched.scale, rng, bunch);
    if (singleGap(setup)) halfDrift(bunch, m);
  } else if (d.kind === 'unmatched') {
    if (m.noBucket) throw new Error(`beam.distribution.kind = unmatched: ${m.noBucket}; use a coasting beam instead`);
    const sigmaE = d.mismatch * linearlyMatchedSpread(m, d.rmsLength);
    if (!(sigmaE > 0))
      throw new Error(
        'beam.distribution.kind = unmatched: the RF slope at φs is 0 (flat well, no linear synchrotron frequency), ' +
        'so the linearly matched energy spread is 0; use a matched distribution',
      );
    sampleUnmatched(d.shape, d.rmsLength, sigmaE, rng, bunch);
  } else {
    sampleCoasting(m, d.rmsEnergySpread, rng, bunch);
  }
  addOffsets(bunch, beam.timeOffset, beam.energyOffset);
  return { bunch, matched };
}

function singleGap(setup: Setup): boolean {
  const p0 = setup.rf.systems[0].position;
  return setup.rf.systems.every((s) => s.position === p0);
}

// dt += ½·T0·η0·δ, δ = dE/(β²E): half of the linear one-turn drift (PHYSICS.md §4, step 3).
function halfDrift(b: Bunch, m: MachineState): void {
  const k = (0.5 * m.T0 * m.eta0) / (m.beta * m.beta * m.Es);
  const { dt, dE } = b;
  for (let i = 0; i < b.total; i++) dt[i] += k * dE[i];
}

function addOffsets(b: Bunch, t0: number, e0: number): void {
  if (t0 === 0 && e0 === 0) return;
  const { dt, dE } = b;
  for (let i = 0; i < b.total; i++) {
    dt[i] += t0;
    dE[i] += e0;
  }
}
