// Benchmark: cost of one pass of the induced-voltage kick (binning, FFT and wake recursion, interpolated kick) and
// of the radiation kick, against the RF kick, for 1e6 particles and 1000 bins. `npx tsx bench/collective.ts [--json]`.
// Bunch: gaussian, σφ = 0.3 rad at the main harmonic; the window holds ±8σ on 1000 bins.
// Each figure is the median of RUNS timed passes after WARMUP passes. Not a test: nothing here passes or fails.
import { performance } from 'node:perf_hooks';
import { makeBunch } from '../core/bunch.ts';
import { inducedKick } from '../core/elements/inducedKick.ts';
import { radiationKick } from '../core/elements/radiationKick.ts';
import { rfKick } from '../core/elements/rfKick.ts';
import type { Element } from '../core/elements/types.ts';
import { machineAtStart } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';

const PARTICLES = 1_000_000, BINS = 1000, RUNS = 21, WARMUP = 10;
const json = process.argv.includes('--json');

// A fictional proton ring, stationary below transition.
const r = parseSetup({
  version: 1, title: 'bench ring (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT: 6, bendingRadius: 20 },
  energy: { start: { quantity: 'kinetic', value: 1e9 } }, rf: { systems: [{ harmonic: 8, voltage: 60e3 }] },
  beam: { distribution: { kind: 'coasting', rmsEnergySpread: 0 }, particles: 10 },
});
if (!r.ok) throw new Error(JSON.stringify(r.errors));
const m = machineAtStart(r.setup);
const b = makeBunch(PARTICLES);
const rng = makeRng(1);
const sigT = 0.3 / m.omegaRf;
for (let i = 0; i < PARTICLES; i++) {
  b.dt[i] = sigT * rng.normal();
  b.dE[i] = 1e5 * rng.normal();
}
const grid = { e0: -8 * sigT, delta: (16 * sigT) / BINS, nb: BINS };
const base = { particlesPerBunch: 1e11, bunchCharge: 1.6e-8, bunches: 1, bins: BINS, smoothing: 1, window: 0 };

function median(xs: number[]): number {
  const s = [...xs].sort((a, c) => a - c);
  return s[Math.floor(s.length / 2)];
}

// ms per pass; dE is restored from a copy between passes so every pass sees the same bunch (copy not timed).
function time(e: Element): number {
  const keep = b.dE.slice();
  const ts: number[] = [];
  for (let k = 0; k < WARMUP + RUNS; k++) {
    b.dE.set(keep);
    const t0 = performance.now();
    e.apply(b, m);
    if (k >= WARMUP) ts.push(performance.now() - t0);
  }
  b.dE.set(keep);
  return median(ts);
}

const cases: { name: string; ms: number }[] = [
  { name: 'RF kick (1 system)', ms: time(rfKick([0])) },
  { name: 'induced kick: Z/n (FFT path)', ms: time(inducedKick({ ...base, impedances: [{ kind: 'inductive', imZOverN: 5 }] }, grid)) },
  { name: 'induced kick: 2 resonators (wake recursion)', ms: time(inducedKick({ ...base, impedances: [
    { kind: 'resonator', shuntImpedance: 1e4, quality: 1, frequency: 1e9 },
    { kind: 'resonator', shuntImpedance: 1e5, quality: 5000, frequency: 40e6 },
  ] }, grid)) },
  { name: 'induced kick: Z/n + space charge + 2 resonators', ms: time(inducedKick({ ...base, impedances: [
    { kind: 'inductive', imZOverN: 5 },
    { kind: 'spaceCharge', beamRadius: 0.01, pipeRadius: 0.05, geometry: 'onAxis' },
    { kind: 'resonator', shuntImpedance: 1e4, quality: 1, frequency: 1e9 },
    { kind: 'resonator', shuntImpedance: 1e5, quality: 5000, frequency: 40e6 },
  ] }, grid)) },
  { name: 'radiation: damping + quantum excitation', ms: time(radiationKick({ JE: 2, I2: 2 * Math.PI / 20, I3: 2 * Math.PI / 400 }, { damping: true, quantumExcitation: true, seed: 3 })) },
];

// V8's sine has a fast path for |x| < π/4: the RF kick is cheaper for short bunches. Same kick, bunch σφ = 1 rad.
const keepDt = b.dt.slice();
for (let i = 0; i < PARTICLES; i++) b.dt[i] *= 1 / 0.3;
cases.push({ name: 'RF kick, long bunch (σφ = 1 rad)', ms: time(rfKick([0])) });
b.dt.set(keepDt);

const rf = cases[0].ms;
if (json) console.log(JSON.stringify({ particles: PARTICLES, bins: BINS, cases: cases.map((c) => ({ ...c, relativeToRf: c.ms / rf })) }));
else {
  console.log(`one pass over ${PARTICLES.toExponential(0)} particles, ${BINS} bins (median of ${RUNS})`);
  for (const c of cases) console.log(`${c.name.padEnd(50)} ${c.ms.toFixed(2).padStart(7)} ms   ${(c.ms / rf).toFixed(2)} × RF kick`);
}
