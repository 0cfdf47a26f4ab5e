// Benchmark of the standalone turn kernels (core/kernels): million particle-turns per second (Mpt/s) for
// {js, wasm} × {1 RF, 2 RF} × {linear, exact drift}, one thread, fused kick + drift with the loss count.
// `npx tsx bench/kernels-wasm.ts` prints a table; `--json` prints { "kernels": [...] }; `--threads` adds the
// wasm cases on 2 worker threads (threads: 2).
// Each figure is the median of RUNS timed runs after one warm-up run. Not a test: nothing here passes or fails.
import { performance } from 'node:perf_hooks';
import { Worker } from 'node:worker_threads';
import { createJsKernel, createWasmKernel, makeDriftParams, makeKickParams, type TurnKernel } from '../core/kernels/index.ts';
import { wasmApi } from '../core/kernels/wasm.ts';
import { kernelSpeed } from '../core/kernels/speed.ts';
import { buildKernelModule, HEAP_BASE, kernelName } from '../core/kernels/wasmModule.ts';

const RUNS = 7;
const PARTICLES = 1_000_000;
const TURNS = 50;
const PAGE = 65536;
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

function run(kernel: TurnKernel, rf: 1 | 2, drift: 'linear' | 'exact'): KernelCase {
  const k = kernelSpeed(kernel, rf, drift, PARTICLES, TURNS, RUNS);
  return { name: `${rf} RF, ${drift} drift`, particles: k.particles, turns: k.turns, rfSystems: rf, drift, threads: 1, impl: k.impl, mpts: k.mpts };
}

// The worker: plain JavaScript (evaluated, so no TypeScript loader is needed in the thread). As in the app's split
// mode, each worker has its own WebAssembly memory (parameters copied in) and its own half of the particles.
// (One memory shared by both threads ran 1.2–1.5× here, against ~1.9× with a memory each.)
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const { module, n, params, fn, seed, sigT } = workerData;
const bytes = ${HEAP_BASE} + 16 * n + 64;
const memory = new WebAssembly.Memory({ initial: Math.ceil(bytes / ${PAGE}) });
const ex = new WebAssembly.Instance(module, { env: { memory } }).exports;
new Float64Array(memory.buffer, 0, params.length).set(params);
const base = ${HEAP_BASE};
const dt = new Float64Array(memory.buffer, base, n), dE = new Float64Array(memory.buffer, base + 8 * n, n);
const f = ex[fn];
parentPort.on('message', (job) => {
  if (job.turns !== undefined) {
    const t0 = performance.now();
    let out = 0;
    for (let t = 0; t < job.turns; t++) out += f(base, base + 8 * n, n);
    parentPort.postMessage({ ms: performance.now() - t0, out });
    return;
  }
  // a fresh bunch each run (not timed): Box–Muller from a small LCG, seeded per run and worker
  let s = (job.seed >>> 0) || 1;
  const u = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) + 0.5) / 4294967296;
  for (let i = 0; i < n; i++) {
    const r = Math.sqrt(-2 * Math.log(u())), th = 2 * Math.PI * u();
    dt[i] = sigT * r * Math.cos(th);
    dE[i] = 1e5 * r * Math.sin(th);
  }
  parentPort.postMessage('filled');
});`;

// Two threads: the particles split in halves over 2 Node worker_threads, each with its own kernel instance and
// memory. Single-particle dynamics need no barrier, so each worker tracks its half for all turns; the figure is the
// wall time from the start signal until both are done (`--threads`; Node only, not in core/).
async function threadCases(): Promise<KernelCase[]> {
  const module = new (wasmApi()!.Module)(buildKernelModule());
  const kernels: KernelCase[] = [];
  const half = PARTICLES / 2, sigT = 0.05 / (8 * w0);
  for (const [rf, drift] of [[1, 'linear'], [2, 'linear'], [1, 'exact'], [2, 'exact']] as const) {
    // The parameter block as the kernel writes it (kick, drift, series, limits): one call on no particles.
    const k = createWasmKernel();
    const kick = makeKickParams();
    kick.count = rf;
    const A = [60e3, 30e3], W = [8 * w0, 16 * w0], PHI = [0.1, Math.PI + 0.2];
    for (let j = 0; j < rf; j++) [kick.amplitude[j], kick.omega[j], kick.phase[j]] = [A[j], W[j], PHI[j]];
    kick.dEsync = k.syncGain(kick);
    const d = makeDriftParams(drift);
    Object.assign(d, { slip: (T0 * eta0) / (beta2 * Es), period: T0, Es, beta2, gamma2, alpha0 });
    k.kickDrift(k.allocColumns(0), 0, kick, d, { dtMax: T0 / 2, dEmax: 0.5 * Es });
    const p = new Float64Array(k.memory.buffer.slice(0, HEAP_BASE));
    const fn = kernelName(rf, drift);
    const workers = [0, 1].map(() => new Worker(WORKER_SOURCE, { eval: true, workerData: { module, n: half, params: p, fn, sigT } }));
    const next = (w: Worker) => new Promise<unknown>((resolve) => w.once('message', resolve));
    const mpts: number[] = [];
    for (let r = 0; r <= RUNS; r++) {
      const filled = workers.map(next);
      workers.forEach((w, k) => w.postMessage({ seed: 1000 * r + k + 1 }));
      await Promise.all(filled);
      const done = workers.map(next);
      const t0 = performance.now();
      workers.forEach((w) => w.postMessage({ turns: TURNS }));
      const res = (await Promise.all(done)) as { out: number }[];
      const s = (performance.now() - t0) / 1e3;
      if (res[0].out + res[1].out !== 0) throw new Error('bench bunch lost particles');
      if (r > 0) mpts.push((PARTICLES * TURNS) / s / 1e6); // run 0 is the warm-up
    }
    await Promise.all(workers.map((w) => w.terminate()));
    kernels.push({ name: `${rf} RF, ${drift} drift`, particles: PARTICLES, turns: TURNS, rfSystems: rf, drift, threads: 2, impl: 'wasm', mpts: median(mpts) });
  }
  return kernels;
}

const kernels: KernelCase[] = [];
for (const make of [() => createJsKernel(), () => createWasmKernel({ initialParticles: PARTICLES })])
  for (const [rf, drift] of [[1, 'linear'], [2, 'linear'], [1, 'exact'], [2, 'exact']] as const) kernels.push(run(make(), rf, drift));

if (process.argv.includes('--threads')) kernels.push(...(await threadCases()));

if (json) process.stdout.write(JSON.stringify({ kernels }, null, 2) + '\n');
else {
  console.log(`turn kernels (${process.platform} ${process.arch}, node ${process.version}); median of ${RUNS} runs after a warm-up`);
  console.log('case                       particles  turns  impl  threads     Mpt/s');
  for (const k of kernels)
    console.log(`${k.name.padEnd(26)} ${String(k.particles).padStart(9)} ${String(k.turns).padStart(6)}  ${k.impl.padEnd(4)} ${String(k.threads).padStart(7)} ${k.mpts.toFixed(1).padStart(9)}`);
}
