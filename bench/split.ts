// Benchmark of the app's split: the demo ring (examples/alder-booster.json, exact drift) with 1e6 particles, tracked by
// the full tracker (core/tracker.ts) on one Node worker thread, and split in halves over two (each with its own
// tracker and kernel memory, as workers/trackWorker.ts does). Rounds of 50 turns alternate between the two, so a
// change of the machine's load hits both alike; prints each round and the median ratio, and each thread's own time
// against half of the one thread's. `npx tsx bench/split.ts`. Not a test: nothing here passes or fails.
import { performance } from 'node:perf_hooks';
import { Worker } from 'node:worker_threads';

const TURNS = 50, ROUNDS = 7;
const part = new URL('./splitPart.mjs', import.meta.url);
const start = (k: number, count: number) => new Worker(part, { workerData: { k, count } });
const next = (w: Worker) => new Promise<unknown>((resolve, reject) => { w.once('message', resolve); w.once('error', reject); });

// One round: every thread of the group tracks TURNS turns; wall time and each thread's own tracking time [ms].
async function round(group: Worker[]): Promise<{ wall: number; own: number[] }> {
  const t0 = performance.now();
  const done = group.map(next);
  group.forEach((w) => w.postMessage(TURNS));
  const own = (await Promise.all(done)) as number[];
  return { wall: performance.now() - t0, own };
}

const one = [start(0, 1)], two = [start(0, 2), start(1, 2)];
await Promise.all([...one, ...two].map(next)); // beams generated
await round(one);
await round(two); // warm-up
const ratios: number[] = [];
console.log(`split benchmark: demo ring, 1e6 particles, ${ROUNDS} alternating rounds of ${TURNS} turns`);
for (let r = 0; r < ROUNDS; r++) {
  const a = await round(one), b = await round(two);
  ratios.push(a.wall / b.wall);
  const mpts = (wall: number) => ((1e6 * TURNS) / wall / 1e3).toFixed(0);
  console.log(`  one thread ${mpts(a.wall)} Mpt/s, two ${mpts(b.wall)} Mpt/s (${(a.wall / b.wall).toFixed(2)}x); ` +
    `the two threads' own times ${b.own.map((x) => x.toFixed(0)).join(' and ')} ms against ${(a.own[0] / 2).toFixed(0)} ms for half of one`);
}
console.log(`median ratio ${[...ratios].sort((x, y) => x - y)[ROUNDS >> 1].toFixed(2)}x`);
await Promise.all([...one, ...two].map((w) => w.terminate()));
