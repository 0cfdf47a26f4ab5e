// Benchmark: cost of the induced-voltage kick for 1e6 particles and 1000 bins against the cost of the RF kick,
// and of the radiation kick. `npm run bench:collective [-- --json]`. Not a test: nothing here passes or fails.
// How the tracker runs it: with a turn kernel, the induced kick rides in the kernel's kick–drift pass (interpolated
// with the RF kick, deposit after the drift: core/kernels InducedParams); its cost is the tracker's turn with the
// impedances minus the same turn without them (binning fold, FFT / wake recursion, the kick and the deposit).
// The element's own passes (the reference path, used when radiation or added elements act between kick and drift)
// are timed too. Bunch: gaussian, σφ = 0.3 rad at h = 8, window ±8σ on 1000 bins. Medians of RUNS after WARMUP.
// Times are CPU time of this (single-threaded) process, so that other jobs on a shared machine do not inflate them.
import { loadavg } from 'node:os';
import { bunchFrom, makeBunch, type Bunch } from '../core/bunch.ts';
import { inducedKick } from '../core/elements/inducedKick.ts';
import { radiationKick } from '../core/elements/radiationKick.ts';
import { rfKick } from '../core/elements/rfKick.ts';
import type { Element } from '../core/elements/types.ts';
import { createKernel, makeKickParams } from '../core/kernels/index.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import type { ImpedanceSetup } from '../core/setup/collective.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

const PARTICLES = 1_000_000, BINS = 1000, RUNS = 31, WARMUP = 10;
const json = process.argv.includes('--json');

const zn: ImpedanceSetup[] = [{ kind: 'inductive', imZOverN: 5 }];
const resonators: ImpedanceSetup[] = [
  { kind: 'resonator', shuntImpedance: 1e4, quality: 1, frequency: 1e9 },
  { kind: 'resonator', shuntImpedance: 1e5, quality: 5000, frequency: 40e6 },
];
const all: ImpedanceSetup[] = [...zn, { kind: 'spaceCharge', beamRadius: 0.01, pipeRadius: 0.05, geometry: 'onAxis' }, ...resonators];

// A fictional proton ring, stationary below transition; window ±8σ.
function setupWith(impedances: ImpedanceSetup[]) {
  const sigT = 0.3 / (8 * 2 * Math.PI * 954_000); // ω_rf for h = 8 at ~0.95 MHz revolution (1 GeV, 300 m)
  const r = parseSetup({
    version: 1, title: 'bench ring (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT: 6, bendingRadius: 20 },
    energy: { start: { quantity: 'kinetic', value: 1e9 } }, rf: { systems: [{ harmonic: 8, voltage: 60e3 }] },
    beam: { distribution: { kind: 'coasting', rmsEnergySpread: 0 }, particles: 10 },
    ...(impedances.length ? { intensity: { particlesPerBunch: 1e11 }, impedances, collective: { bins: BINS, smoothing: 1, window: 16 * sigT } } : {}),
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

const m: MachineState = machineAtStart(setupWith([]));
const sigT = 0.3 / m.omegaRf;
const rng = makeRng(1);
const dt0 = new Float64Array(PARTICLES), dE0 = new Float64Array(PARTICLES);
// Matched small-amplitude spread: σE = σt·√(K/|c1|) of the linearised map, K = V·ω_rf·cos φs, c1 = T0·η/(β²E).
const sigE = sigT * Math.sqrt((60e3 * m.omegaRf) / Math.abs((m.T0 * m.eta0) / (m.beta ** 2 * m.Es)));
for (let i = 0; i < PARTICLES; i++) {
  dt0[i] = sigT * rng.normal();
  dE0[i] = sigE * rng.normal();
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, c) => a - c);
  return s[Math.floor(s.length / 2)];
}

// CPU ms of one call of f on bunch b; the coordinates are restored first (not timed), so every call sees the same bunch.
function once(b: Bunch, f: () => void): number {
  b.dt.set(dt0);
  b.dE.set(dE0);
  b.n = PARTICLES;
  const t0 = process.cpuUsage();
  f();
  const d = process.cpuUsage(t0);
  return (d.user + d.system) / 1000;
}

function time(b: Bunch, f: () => void): number {
  const ts: number[] = [];
  for (let k = 0; k < WARMUP + RUNS; k++) {
    const t = once(b, f);
    if (k >= WARMUP) ts.push(t);
  }
  return median(ts);
}

// One tracker turn (wasm kernel) for a setup; the induced element keeps its window and memory between calls.
function trackerOf(impedances: ImpedanceSetup[]): Tracker {
  const b = makeBunch(PARTICLES);
  b.dt.set(dt0);
  b.dE.set(dE0);
  return new Tracker(setupWith(impedances), b, { kernel: 'wasm' });
}
const bareTracker = trackerOf([]);
const bare = time(bareTracker.bunch, () => bareTracker.track(1));

// The RF kick alone in the wasm kernel (the kick half of the fused turn).
const kernel = createKernel('wasm', { initialParticles: PARTICLES });
const cols = kernel.allocColumns(PARTICLES);
const kb = bunchFrom(cols.dt, cols.dE);
const kick = makeKickParams();
kick.amplitude[0] = 60e3; kick.omega[0] = m.omegaRf; kick.phase[0] = m.phiS;
kick.dEsync = kernel.syncGain(kick);
const rfKickOnce = () => once(kb, () => kernel.kick(cols, PARTICLES, kick));
const rfWasm = time(kb, () => kernel.kick(cols, PARTICLES, kick));

// Added cost of the impedances in the tracker's turn: median of the differences of turns timed in turn with the
// bare tracker's (pairs taken close in time, so a change of load hits both), and the median of its ratio to the RF
// kick timed in the same round (the host's speed drifts by ±20 % over a minute: a ratio of neighbours is steadier).
function fused(impedances: ImpedanceSetup[]): { ms: number; ratio: number } {
  const tr = trackerOf(impedances);
  const ds: number[] = [], rs: number[] = [];
  for (let k = 0; k < WARMUP + RUNS; k++) {
    const d = once(tr.bunch, () => tr.track(1)) - once(bareTracker.bunch, () => bareTracker.track(1));
    const r = rfKickOnce();
    if (k >= WARMUP) { ds.push(d); rs.push(d / r); }
  }
  return { ms: median(ds), ratio: median(rs) };
}

const plain = makeBunch(PARTICLES);
const element = (e: Element) => time(plain, () => e.apply(plain, m));
const grid = { e0: -8 * sigT, delta: (16 * sigT) / BINS, nb: BINS };
const model = (impedances: ImpedanceSetup[]) => ({ particlesPerBunch: 1e11, bunchCharge: 1.6e-8, bunches: 1, bins: BINS, smoothing: 1, window: 0, impedances });

const cases: { name: string; ms: number; ratio?: number }[] = [
  { name: 'RF kick alone, wasm kernel (1 system)', ms: rfWasm },
  { name: 'tracker turn without intensity (wasm: RF kick + drift)', ms: bare },
  { name: 'induced kick in the turn: Z/n (FFT)', ...fused(zn) },
  { name: 'induced kick in the turn: 2 resonators (wake recursion)', ...fused(resonators) },
  { name: 'induced kick in the turn: Z/n + space charge + 2 resonators', ...fused(all) },
  { name: 'RF kick, reference element (Math.sin)', ms: element(rfKick([0])) },
  { name: 'induced kick, own passes: Z/n + space charge + 2 resonators', ms: element(inducedKick(model(all), grid)) },
  { name: 'radiation: damping + quantum excitation', ms: element(radiationKick({ JE: 2, I2: 2 * Math.PI / 20, I3: 2 * Math.PI / 400 }, { damping: true, quantumExcitation: true, seed: 3 })) },
];

const rf = rfWasm;
const load = loadavg()[0];
// Relative to the RF kick: for the induced kicks the median ratio to the kick timed in the same round.
const relative = (c: { ms: number; ratio?: number }) => c.ratio ?? c.ms / rf;
if (json) console.log(JSON.stringify({ particles: PARTICLES, bins: BINS, loadAverage: load, cases: cases.map(({ name, ms, ...c }) => ({ name, ms, relativeToRfKick: relative({ ms, ...c }) })) }));
else {
  console.log(`${PARTICLES.toExponential(0)} particles, ${BINS} bins, CPU time, median of ${RUNS} (load average ${load.toFixed(1)}); relative to the wasm RF kick`);
  for (const c of cases) console.log(`${c.name.padEnd(62)} ${c.ms.toFixed(2).padStart(7)} ms   ${relative(c).toFixed(2)} ×${c.ratio === undefined ? '' : ' (same rounds)'}`);
}
