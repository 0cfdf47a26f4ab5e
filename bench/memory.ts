// Benchmark: memory of a 1e6-particle tracker (what one tracking worker holds) and JS allocation per turn.
// `npm run bench:memory [-- --json]` (runs node with --expose-gc so every baseline is taken after a collection).
// Not a test: nothing here passes or fails.
// 1. 1e6 particles from examples/alder-booster.json, default kernel: the memory held, the heap growth over TURNS
//    turns without a collection, and what a full collection leaves of it (a leak would stay; garbage goes).
// 2. Bytes allocated per turn in V8's young generation (where boxed numbers and other short-lived objects go), by
//    kernel ('stepper': MachineStepper.advance alone), with the example's ramp and with a flat one. Each case runs
//    in a fresh node process, so no case warms the code of the next.
//    'first': turns 20–320 of a 1e5-particle bunch (median of three windows). V8 still runs the once-per-turn code (machine state,
//    synchronous phase, kernel parameters) unoptimized there, and unoptimized code boxes every floating-point
//    number it computes into a new 16-byte HeapNumber: garbage that stops as the optimizing compiler takes over
//    (in Node 20 from ~turn 1000 to ~3000, function by function).
//    'optimized': a 2000-particle bunch continues to WARM turns (same code, so it carries on where the first bunch
//    left V8), then the median of WINDOWS windows (those without a collection). Numbers boxed where they cross a
//    call the compiler did not inline (arguments, return values) would show here: the per-turn code of the kernels'
//    path writes them into objects and typed arrays instead (core/machine.ts KINEMATICS); the reference elements
//    still pass them.
//    Every window starts after a collection; one in which V8 collected anyway is left out, or flagged if none is left.
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { GCProfiler, getHeapSpaceStatistics } from 'node:v8';
import { generateBeam } from '../core/beam/index.ts';
import { machineAtStart, MachineStepper } from '../core/machine.ts';
import type { Setup } from '../core/setup/schema.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker, type KernelChoice } from '../core/tracker.ts';

const PARTICLES = 1_000_000;
const TURNS = 300;
const FIRST = { from: 20, turns: 300, windows: 3, particles: 100_000 }; // enough particles to optimize the kernel loops in turn 1
const PROBE_PARTICLES = 2000; // for the WARM turns
const WARM = 6000; // turns after which Node 20 has optimized the per-turn code (allocation flat from ~3000 on)
const WINDOWS = 5;
const WINDOW_TURNS = 200;
const CASES: { kernel: KernelChoice | 'stepper'; ramp: 'example' | 'flat' }[] = [];
for (const kernel of ['wasm', 'js', 'reference', 'stepper'] as const) for (const ramp of ['example', 'flat'] as const) CASES.push({ kernel, ramp });

const json = process.argv.includes('--json');
const gc = (globalThis as { gc?: () => void }).gc;
const MB = 2 ** 20;

function loadSetup(particles: number, ramp: 'example' | 'flat'): Setup {
  const doc = JSON.parse(readFileSync(new URL('../examples/alder-booster.json', import.meta.url), 'utf8'));
  doc.beam.particles = particles;
  if (ramp === 'flat') doc.energy.ramp = { kind: 'flat' };
  const r = parseSetup(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Bytes in V8's young generation, where short-lived objects (boxed numbers among them) are allocated; compiled
// code and type feedback, which also grow while V8 optimizes, go elsewhere.
const youngBytes = () => getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')?.space_used_size ?? NaN;
// What one reading allocates itself (the statistics array, ~2 kB): taken off every window, which would otherwise
// show ~10 B per turn with nothing allocated by the turns.
const READING = (() => {
  gc?.();
  const a = youngBytes();
  return youngBytes() - a;
})();

/** Young-generation bytes allocated per turn over n turns, after a collection; gcs = collections V8 made meanwhile. */
function perTurn(run: (n: number) => void, n: number): { bytesPerTurn: number; gcs: number } {
  gc?.();
  const prof = new GCProfiler();
  prof.start();
  const before = youngBytes();
  run(n);
  const after = youngBytes();
  const gcs = prof.stop()?.statistics.length ?? 0;
  return { bytesPerTurn: (after - before - READING) / n, gcs };
}

// Median over the windows without a collection (gcs > 0: every window had one).
function median(ws: { bytesPerTurn: number; gcs: number }[]): { bytesPerTurn: number; gcs: number } {
  const clean = ws.filter((w) => w.gcs === 0).map((w) => w.bytesPerTurn).sort((a, b) => a - b);
  return clean.length ? { bytesPerTurn: clean[clean.length >> 1], gcs: 0 } : { bytesPerTurn: NaN, gcs: ws.length };
}

// A function that tracks n more turns of one case, and the kernel it uses.
function runner(kernel: KernelChoice | 'stepper', ramp: 'example' | 'flat', particles: number): { run: (n: number) => void; impl: string } {
  const setup = loadSetup(particles, ramp);
  if (kernel === 'stepper') {
    const st = new MachineStepper(setup);
    return { run: (n) => { for (let i = 0; i < n; i++) st.advance(); }, impl: kernel };
  }
  const tr = new Tracker(setup, generateBeam(setup, machineAtStart(setup)).bunch, { kernel });
  return { run: (n) => tr.track(n), impl: tr.impl };
}

// One case, in this process (called in a child: `memory.ts --case <kernel> <ramp>`); prints JSON. The first window
// runs a bunch of FIRST.particles; a second tracker of PROBE_PARTICLES (same code, so it starts where the first
// left V8) then runs to WARM turns for the optimized windows.
function runCase(kernel: KernelChoice | 'stepper', ramp: 'example' | 'flat'): void {
  const big = runner(kernel, ramp, FIRST.particles);
  big.run(FIRST.from);
  const firstWindows = Array.from({ length: FIRST.windows }, () => perTurn(big.run, FIRST.turns / FIRST.windows));
  const { run, impl } = runner(kernel, ramp, PROBE_PARTICLES);
  run(WARM - FIRST.from - FIRST.turns);
  const windows = Array.from({ length: WINDOWS }, () => perTurn(run, WINDOW_TURNS));
  process.stdout.write(JSON.stringify({ kernel, impl, ramp, first: median(firstWindows), optimized: median(windows), firstWindows, windows }) + '\n');
}

const mem = () => {
  const m = process.memoryUsage();
  return { rssMB: m.rss / MB, heapUsedMB: m.heapUsed / MB, arrayBuffersMB: m.arrayBuffers / MB, externalMB: m.external / MB };
};

// A collection, then a pause for V8's concurrent sweeper to return freed ArrayBuffers (the bunch's first columns,
// copied into the kernel's memory), then another collection: otherwise they still count.
function settle(): void {
  gc?.();
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 300);
  gc?.();
}

function main(): void {
  const setup = loadSetup(PARTICLES, 'example');
  gc?.();
  const start = mem();
  const tracker = new Tracker(setup, generateBeam(setup, machineAtStart(setup)).bunch);
  tracker.track(20); // warm-up: kernels compiled, scratch buffers sized
  settle();
  const before = mem();
  const prof = new GCProfiler();
  prof.start();
  tracker.track(TURNS);
  const gcs = prof.stop()?.statistics.length ?? 0;
  const after = mem();
  gc?.();
  const collected = mem();

  // Each case in a fresh process with the same node flags (--expose-gc, --import tsx).
  const script = fileURLToPath(import.meta.url);
  const cases = CASES.map(({ kernel, ramp }) => {
    const r = spawnSync(process.execPath, [...process.execArgv, script, '--case', kernel, ramp], { encoding: 'utf8' });
    if (r.status !== 0) return { kernel, ramp, error: (r.stderr || r.stdout).trim().split('\n').slice(-1)[0] };
    return JSON.parse(r.stdout.trim().split('\n').pop()!);
  });

  const result = {
    machine: `${process.platform} ${process.arch}, node ${process.version}`,
    particles: PARTICLES, impl: tracker.impl, turns: TURNS, gcExposed: gc !== undefined,
    atStart: start, withTracker: before, afterTurns: after, afterCollection: collected,
    trackerMB: before.externalMB - start.externalMB, // Node's `external` already includes the ArrayBuffers (and wasm memory)
    heapGrowthPerTurnKB: ((after.heapUsedMB - before.heapUsedMB) * 1024) / TURNS,
    collectionsDuringTurns: gcs,
    retainedKB: (collected.heapUsedMB - before.heapUsedMB) * 1024,
    perTurn: { particles: PROBE_PARTICLES, first: FIRST, optimizedAfter: WARM, windows: WINDOWS, windowTurns: WINDOW_TURNS, cases },
  };
  if (json) {
    process.stdout.write(JSON.stringify(result, null, 2) + '\n');
    return;
  }
  const B = (x: { bytesPerTurn: number; gcs: number }) => (x.gcs > 0 ? `(GC in window)` : `${x.bytesPerTurn.toFixed(0)} B`);
  console.log(`Phasewell memory benchmark (${result.machine}), ${PARTICLES} particles, ${tracker.impl} kernel${gc ? '' : ' (no --expose-gc: baselines include garbage)'}`);
  console.log(`tracker (columns in kernel memory and its buffers): ${result.trackerMB.toFixed(1)} MB; rss ${before.rssMB.toFixed(0)} MB, JS heap ${before.heapUsedMB.toFixed(1)} MB`);
  console.log(`JS heap growth over turns 20–${20 + TURNS} without a collection: ${(after.heapUsedMB - before.heapUsedMB).toFixed(2)} MB (${result.heapGrowthPerTurnKB.toFixed(2)} kB per turn)${gcs ? ` (V8 collected ${gcs}× meanwhile: figure too low)` : ''}`);
  console.log(`left of it after a full collection: ${result.retainedKB.toFixed(1)} kB in all (the rest was garbage)`);
  console.log(`\nJS allocation per turn (young generation), each case in a fresh process:`);
  console.log(`  ${''.padEnd(24)} turns ${FIRST.from}–${FIRST.from + FIRST.turns} (median of ${FIRST.windows}), ${FIRST.particles} particles | after ${WARM} turns (median of ${WINDOWS}×${WINDOW_TURNS}), ${PROBE_PARTICLES} particles`);
  for (const c of cases) {
    const name = `${c.kernel}${c.impl && c.impl !== c.kernel ? ` (${c.impl})` : ''}, ${c.ramp === 'flat' ? 'flat' : 'example ramp'}`.padEnd(24);
    console.log(c.error ? `  ${name} failed: ${c.error}` : `  ${name} ${B(c.first).padStart(43)} | ${B(c.optimized).padStart(8)}`);
  }
  console.log('  (first: numbers boxed by not yet optimized per-turn code; optimized: what stays once V8 compiled it)');
  console.log(`  (each window less the ${READING} B that reading the heap statistics allocates)`);
}

const at = process.argv.indexOf('--case');
if (at >= 0) runCase(process.argv[at + 1] as KernelChoice | 'stepper', process.argv[at + 2] as 'example' | 'flat');
else main();
