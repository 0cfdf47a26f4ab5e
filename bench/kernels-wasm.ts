// Benchmark of the standalone turn kernels (core/kernels): million particle-turns per second (Mpt/s) for
// {js, wasm} × {1 RF, 2 RF} × {linear, exact drift}, one thread, fused kick + drift with the loss count.
// `npx tsx bench/kernels-wasm.ts` prints a table; `--json` prints { "kernels": [...] }.
// Each figure is the median of RUNS timed runs after one warm-up run. Not a test: nothing here passes or fails.
import { performance } from 'node:perf_hooks';
import { createJsKernel, createWasmKernel, makeDriftParams, makeKickParams, type TurnKernel } from '../core/kernels/index.ts';
import { makeRng } from '../core/rng.ts';

const RUNS = 7;
const PARTICLES = 1_000_000;
const TURNS = 50;
const json = process.argv.includes('--json');

interface KernelCase { name: string; particles: number; turns: number; rfSystems: number; drift: 'linear' | 'exact'; threads: number; impl: 'wasm' | 'js'; mpts: number }

// A fictional proton ring below transition: 1 GeV kinetic, T0 = 1.14 µs, h = 8 (+ h = 16 at half voltage).
const mp = 938.27208816e6;
const Es = 1e9 + mp;
const gamma2 = (Es / mp) ** 2;
const beta2 = 1 - 1 / gamma2;
const T0 = 300 / (Math.sqrt(beta2) * 299792458);
const w0 = (2 * Math.PI) / T0;
const alpha0 = 1 / 36;
const eta0 = alpha0 - 1 / gamma2;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function run(kernel: TurnKernel, rf: number, drift: 'linear' | 'exact'): KernelCase {
  const kick = makeKickParams();
  kick.count = rf;
  kick.amplitude[0] = 60e3; kick.omega[0] = 8 * w0; kick.phase[0] = 0.1;
  kick.amplitude[1] = 30e3; kick.omega[1] = 16 * w0; kick.phase[1] = Math.PI + 0.2;
  kick.dEsync = kernel.syncGain(kick);
  const d = makeDriftParams(drift);
  d.slip = (T0 * eta0) / (beta2 * Es);
  d.period = T0; d.Es = Es; d.beta2 = beta2; d.gamma2 = gamma2; d.alpha0 = alpha0;
  const limits = { dtMax: T0 / 2, dEmax: 0.5 * Es };
  const cols = kernel.allocColumns(PARTICLES);
  const rng = makeRng(1);
  const sigT = 0.05 / (8 * w0);
  const mpts: number[] = [];
  for (let r = 0; r <= RUNS; r++) {
    for (let i = 0; i < PARTICLES; i++) {
      cols.dt[i] = sigT * rng.normal();
      cols.dE[i] = 1e5 * rng.normal();
    }
    const t0 = performance.now();
    let lost = 0;
    for (let t = 0; t < TURNS; t++) lost += kernel.kickDrift(cols, PARTICLES, kick, d, limits);
    const s = (performance.now() - t0) / 1e3;
    if (lost !== 0) throw new Error(`bench bunch lost ${lost} particle-turns`);
    if (r > 0) mpts.push((PARTICLES * TURNS) / s / 1e6); // run 0 is the warm-up
  }
  kernel.freeColumns(cols);
  return { name: `${rf} RF, ${drift} drift`, particles: PARTICLES, turns: TURNS, rfSystems: rf, drift, threads: 1, impl: kernel.impl, mpts: median(mpts) };
}

const kernels: KernelCase[] = [];
for (const make of [() => createJsKernel(), () => createWasmKernel({ initialParticles: PARTICLES })])
  for (const [rf, drift] of [[1, 'linear'], [2, 'linear'], [1, 'exact'], [2, 'exact']] as const) kernels.push(run(make(), rf, drift));

if (json) process.stdout.write(JSON.stringify({ kernels }, null, 2) + '\n');
else {
  console.log(`turn kernels (${process.platform} ${process.arch}, node ${process.version}); median of ${RUNS} runs after a warm-up`);
  console.log('case                       particles  turns  impl  threads     Mpt/s');
  for (const k of kernels)
    console.log(`${k.name.padEnd(26)} ${String(k.particles).padStart(9)} ${String(k.turns).padStart(6)}  ${k.impl.padEnd(4)} ${String(k.threads).padStart(7)} ${k.mpts.toFixed(1).padStart(9)}`);
}
