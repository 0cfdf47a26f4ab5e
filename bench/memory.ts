// Benchmark: memory of a 1e6-particle tracker (what one tracking worker holds) and allocation per turn.
// `npm run bench:memory [-- --json]` (runs node with --expose-gc so the baseline is taken after a collection).
// Heap growth is read across TURNS turns without a collection in between: allocating per turn would show as
// ~TURNS × the per-turn allocation. Not a test: nothing here passes or fails.
import { readFileSync } from 'node:fs';
import { generateBeam } from '../core/beam/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

const PARTICLES = 1_000_000;
const TURNS = 300;
const json = process.argv.includes('--json');
const gc = (globalThis as { gc?: () => void }).gc;
const MB = 2 ** 20;

const mem = () => {
  const m = process.memoryUsage();
  return { rssMB: m.rss / MB, heapUsedMB: m.heapUsed / MB, arrayBuffersMB: m.arrayBuffers / MB, externalMB: m.external / MB };
};

const doc = JSON.parse(readFileSync(new URL('../examples/alder-booster.json', import.meta.url), 'utf8'));
doc.beam.particles = PARTICLES;
const r = parseSetup(doc);
if (!r.ok) throw new Error(JSON.stringify(r.errors));
gc?.();
const start = mem();
const tracker = new Tracker(r.setup, generateBeam(r.setup, machineAtStart(r.setup)).bunch);
tracker.track(20); // warm-up: kernels compiled, scratch buffers sized
gc?.();
const before = mem();
tracker.track(TURNS);
const after = mem();
const result = {
  machine: `${process.platform} ${process.arch}, node ${process.version}`,
  particles: PARTICLES, impl: tracker.impl, turns: TURNS, gcExposed: gc !== undefined,
  atStart: start, withTracker: before, afterTurns: after,
  trackerMB: before.arrayBuffersMB + before.externalMB - start.arrayBuffersMB - start.externalMB,
  heapGrowthPerTurnKB: ((after.heapUsedMB - before.heapUsedMB) * 1024) / TURNS,
};
if (json) process.stdout.write(JSON.stringify(result, null, 2) + '\n');
else {
  console.log(`Phasewell memory benchmark (${result.machine}), ${PARTICLES} particles, ${tracker.impl} kernel${gc ? '' : ' (no --expose-gc: baselines include garbage)'}`);
  console.log(`tracker (columns in kernel memory and its buffers): ${result.trackerMB.toFixed(1)} MB; rss ${before.rssMB.toFixed(0)} MB, JS heap ${before.heapUsedMB.toFixed(1)} MB`);
  console.log(`JS heap growth over ${TURNS} turns without a collection: ${(after.heapUsedMB - before.heapUsedMB).toFixed(2)} MB (${result.heapGrowthPerTurnKB.toFixed(2)} kB per turn)`);
}
