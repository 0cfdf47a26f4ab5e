// Benchmark: million particle-turns per second (Mpt/s) of the one-turn map, and the time of the bucket
// computations. `npm run bench` prints a table; `npm run bench -- --json` prints one JSON object.
// Each figure is the median of RUNS timed runs after one warm-up run. Not a test: nothing here passes or fails.
import { performance } from 'node:perf_hooks';
import { makeBunch } from '../core/bunch.ts';
import { computeBucket, separatrix } from '../core/bucket.ts';
import { histogram2d } from '../core/diagnostics/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import type { Setup } from '../core/setup/schema.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker, type KernelChoice } from '../core/tracker.ts';

const RUNS = 5;
const json = process.argv.includes('--json');
const PARTICLES = 1_000_000;

interface KernelCase { name: string; particles: number; turns: number; rfSystems: number; drift: 'linear' | 'exact'; threads: number; impl: 'js' | 'wasm' | 'reference'; mpts: number }

// A fictional proton ring, accelerating, below transition.
function benchSetup(rfSystems: number, drift: 'linear' | 'exact'): Setup {
  const systems = [{ harmonic: 8, voltage: 60e3, phase: 0, position: 0 }];
  if (rfSystems > 1) systems.push({ harmonic: 16, voltage: 30e3, phase: 180, position: 0 });
  const r = parseSetup({
    version: 1,
    title: 'bench ring (fictional)',
    particle: { kind: 'proton' },
    ring: { circumference: 300, gammaT: 6 },
    energy: { start: { quantity: 'kinetic', value: 1e9 }, ramp: { kind: 'gainPerTurn', value: 5e3 } },
    rf: { systems },
    beam: { distribution: { kind: 'coasting', rmsEnergySpread: 1e5 }, particles: PARTICLES },
    run: { drift, momentumAperture: 0.5 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// A small bunch inside the bucket: nobody is lost, so every run tracks the same count.
function fillBunch(setup: Setup) {
  const m = machineAtStart(setup);
  const b = makeBunch(PARTICLES);
  const rng = makeRng(1);
  const sigT = 0.05 / m.omegaRf;
  for (let i = 0; i < PARTICLES; i++) {
    b.dt[i] = sigT * rng.normal();
    b.dE[i] = 1e5 * rng.normal();
  }
  return b;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function kernelCase(rfSystems: number, drift: 'linear' | 'exact', turns: number, kernel: KernelChoice): KernelCase {
  const setup = benchSetup(rfSystems, drift);
  const mpts: number[] = [];
  let impl: KernelCase['impl'] = 'reference';
  for (let run = 0; run <= RUNS; run++) {
    const tracker = new Tracker(setup, fillBunch(setup), { kernel });
    impl = tracker.impl;
    const t0 = performance.now();
    tracker.track(turns);
    const s = (performance.now() - t0) / 1e3;
    if (run > 0) mpts.push((tracker.bunch.n * turns) / s / 1e6); // run 0 is the warm-up
  }
  return { name: `${rfSystems} RF, ${drift} drift`, particles: PARTICLES, turns, rfSystems, drift, threads: 1, impl, mpts: median(mpts) };
}

function timeMs(f: () => void, reps: number): number {
  f();
  const ts: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    f();
    ts.push(performance.now() - t0);
  }
  return median(ts);
}

// The tracker with each implementation of the turn: WebAssembly SIMD kernel, TypeScript kernel (both with the
// polynomial sine) and the reference elements (Math.sin). 'wasm' is what the tracker picks by default here.
const kernels: KernelCase[] = [];
for (const kernel of ['wasm', 'js', 'reference'] as const)
  for (const [rf, drift] of [[1, 'linear'], [1, 'exact'], [2, 'linear'], [2, 'exact']] as const) kernels.push(kernelCase(rf, drift, 40, kernel));

const m1 = machineAtStart(benchSetup(1, 'linear'));
const m2 = machineAtStart(benchSetup(2, 'linear'));
const bucketMs = (m: typeof m1) => timeMs(() => {
  const r = computeBucket(m);
  if (r.ok) separatrix(m, r.bucket);
}, 21);
const hist = new Float32Array(256 * 256);
const bunch = fillBunch(benchSetup(1, 'linear'));
const histogramMs = timeMs(() => histogram2d(bunch, -5e-9, 5e-9, -5e5, 5e5, 256, 256, hist), 11);
const memoryMB = process.memoryUsage().arrayBuffers / 2 ** 20;

const result = {
  machine: `${process.platform} ${process.arch}, node ${process.version}`,
  kernels,
  separatrixMs: { oneRf: bucketMs(m1), twoRf: bucketMs(m2) },
  histogram2dMs: { particles: PARTICLES, bins: '256x256', ms: histogramMs },
  arrayBuffersMB: memoryMB,
};

if (json) process.stdout.write(JSON.stringify(result, null, 2) + '\n');
else {
  console.log(`Phasewell kernel benchmark (${result.machine}); median of ${RUNS} runs after a warm-up`);
  console.log('case                       particles  turns  impl       threads     Mpt/s');
  for (const k of kernels)
    console.log(`${k.name.padEnd(26)} ${String(k.particles).padStart(9)} ${String(k.turns).padStart(6)}  ${k.impl.padEnd(9)} ${String(k.threads).padStart(7)} ${k.mpts.toFixed(1).padStart(9)}`);
  console.log(`bucket + separatrix: ${result.separatrixMs.oneRf.toFixed(2)} ms (1 RF), ${result.separatrixMs.twoRf.toFixed(2)} ms (2 RF)`);
  console.log(`2-D histogram of ${PARTICLES} particles, 256x256: ${histogramMs.toFixed(1)} ms`);
  console.log(`typed-array memory in use: ${memoryMB.toFixed(1)} MB`);
}
