// A thread of bench/split.ts: the demo beam generated whole (same seed in every thread), part k of count kept and
// tracked on request. Plain JavaScript that registers the TypeScript loader, since a worker thread does not
// inherit it.
import { register } from 'tsx/esm/api';
import { workerData, parentPort } from 'node:worker_threads';

register();
const { readFileSync } = await import('node:fs');
const { generateBeam } = await import('../core/beam/index.ts');
const { bunchFrom } = await import('../core/bunch.ts');
const { machineAtStart } = await import('../core/machine.ts');
const { parseSetup } = await import('../core/setup/validate.ts');
const { Tracker } = await import('../core/tracker.ts');

const doc = JSON.parse(readFileSync(new URL('../examples/alder-booster.json', import.meta.url), 'utf8'));
doc.beam.particles = 1_000_000;
const parsed = parseSetup(doc);
if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
const s = parsed.setup;
const { bunch } = generateBeam(s, machineAtStart(s));
const { k, count } = workerData, n = bunch.n;
const lo = Math.floor((k * n) / count), hi = Math.floor(((k + 1) * n) / count);
const tracker = new Tracker(s, count === 1 ? bunch : bunchFrom(bunch.dt.slice(lo, hi), bunch.dE.slice(lo, hi)));
parentPort.on('message', (turns) => {
  const t0 = performance.now();
  tracker.track(turns);
  parentPort.postMessage(performance.now() - t0);
});
parentPort.postMessage('ready');
