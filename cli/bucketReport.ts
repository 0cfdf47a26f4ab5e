// The `bucket` command's report: kinematics, RF, synchronous phase, bucket and matched bunch of a setup at turn 0.
// Units are in every key name (eV, s, Hz, rad, deg, eV·s written eVs).
import { computeBucket } from '../core/bucket.ts';
import { matchBunch } from '../core/beam/index.ts';
import { intensitySummary } from '../core/collective/summary.ts';
import { machineAtStart } from '../core/machine.ts';
import { radiationSummary } from '../core/radiation.ts';
import type { Setup } from '../core/setup/schema.ts';
import { smallAmplitudeTune } from '../core/synchrotron.ts';

const RAD2DEG = 180 / Math.PI;

/** Everything `bucket` prints, as a plain JSON-ready object. */
export function bucketReport(setup: Setup): Record<string, unknown> {
  const m = machineAtStart(setup);
  const base = {
    title: setup.title,
    particle: { name: m.particle.name, restEnergy_eV: m.particle.mass, chargeState: m.particle.Z },
    totalEnergy_eV: m.Es,
    kineticEnergy_eV: m.T,
    momentum_eV: m.pc,
    gamma: m.gamma,
    beta: m.beta,
    transitionGamma: 1 / Math.sqrt(Math.abs(m.compaction.alpha0)),
    revolutionFrequency_Hz: m.f0,
    revolutionPeriod_s: m.T0,
    rfFrequencies_Hz: m.rf.map((r) => r.h * m.f0),
    slipFactor: m.eta0,
    slipFactor2: m.eta1,
    energyGainPerTurn_eV: m.dEs,
    stableSlope: m.slope,
    radiation: radiationSummary(setup, m),
  };
  if (m.noBucket) return { ...base, bucket: null, noBucket: m.noBucket };
  const tune = smallAmplitudeTune(m);
  const sync = {
    synchronousPhase_rad: m.phiS,
    synchronousPhase_deg: m.phiS * RAD2DEG,
    rfPhases_deg: m.rf.map((r) => r.phi * RAD2DEG),
    synchrotronTune: tune.Qs,
    synchrotronTuneMap: tune.QsMap,
    synchrotronFrequency_Hz: tune.fs,
  };
  const br = computeBucket(m);
  if (!br.ok) return { ...base, ...sync, bucket: null, noBucket: br.reason };
  const b = br.bucket;
  const bucket = {
    area_eVs: b.area,
    halfHeight_eV: b.halfHeightDE,
    halfHeight_relative: b.halfHeightDelta,
    length_s: b.length,
    stableFixedPoint_deg: b.phiS * RAD2DEG,
    unstableFixedPoints_deg: b.unstable.map((p) => p * RAD2DEG),
    ends_deg: [b.phiLeft * RAD2DEG, b.phiRight * RAD2DEG],
    subBuckets: b.subBuckets.map((s) => ({ stableFixedPoint_deg: s.phiS * RAD2DEG, area_eVs: s.area })),
  };
  const d = setup.beam.distribution;
  let matchedBunch: Record<string, unknown> | null = null;
  if (d.kind === 'matched') {
    const mb = matchBunch(m, b, d.shape, d.size);
    matchedBunch = {
      shape: mb.shape,
      requested: d.size,
      rmsLength_s: mb.rmsLength,
      rmsEnergySpread_eV: mb.rmsEnergySpread,
      emittanceRms_eVs: mb.emittanceRms,
      emittanceFourSigma_eVs: mb.emittanceFourSigma,
      emittanceContour_eVs: mb.contourArea,
      contourFullLength_s: mb.contourLength,
      contourHalfHeight_eV: mb.contourHalfHeight,
      fillingFactor: mb.fillingFactor,
      conventions:
        'rms = sqrt(<dt²><dE²>-<dt·dE>²) without π; fourSigma = 4π·σt·σE; contour = area of the Hamiltonian contour bounding the bunch',
    };
  }
  return { ...base, ...sync, bucket, matchedBunch, intensity: intensitySummary(setup, m) };
}
