// Benchmark: time of the per-turn diagnostics reductions for 1e6 particles of the demo setup (matched bunch).
// `npm run bench:diagnostics`; median of RUNS runs after a warm-up. Not a test.
import { performance } from 'node:perf_hooks';
import { readFileSync } from 'node:fs';
import { generateBeam } from '../core/beam/index.ts';
import { computeBucket } from '../core/bucket.ts';
import { computeDiagnostics, histogram2d, insideSeparatrix, lineDensity } from '../core/diagnostics/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { parseSetup } from '../core/setup/validate.ts';

const RUNS = 7;
const PARTICLES = 1_000_000;
const json = process.argv.includes('--json');

const doc = JSON.parse(readFileSync(new URL('../examples/alder-booster.json', import.meta.url), 'utf8'));
doc.beam.particles = PARTICLES;
const r = parseSetup(doc);
if (!r.ok) throw new Error(JSON.stringify(r.errors));
const m = machineAtStart(r.setup);
const { bunch } = generateBeam(r.setup, m);
const br = computeBucket(m);
if (!br.ok) throw new Error(br.reason);
const bucket = br.bucket;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}
function timeMs(f: () => void): number {
  f();
  const ts: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    f();
    ts.push(performance.now() - t0);
  }
  return median(ts);
}

const hist = new Float32Array(200 * 160);
const prof = new Float64Array(r.setup.run.profileBins);
const result = {
  machine: `${process.platform} ${process.arch}, node ${process.version}`,
  particles: PARTICLES,
  computeDiagnosticsMs: timeMs(() => computeDiagnostics(bunch, m, bucket, r.setup.run.profileBins)),
  insideSeparatrixMs: timeMs(() => insideSeparatrix(bunch, m, bucket)),
  histogram2dMs: timeMs(() => histogram2d(bunch, -5e-8, 5e-8, -5e6, 5e6, 200, 160, hist)),
  lineDensityMs: timeMs(() => lineDensity(bunch, -5e-8, 5e-8, prof)),
};
if (json) process.stdout.write(JSON.stringify(result, null, 2) + '\n');
else {
  console.log(`Phasewell diagnostics benchmark (${result.machine}), ${PARTICLES} particles, median of ${RUNS}`);
  for (const [k, v] of Object.entries(result)) if (typeof v === 'number' && k !== 'particles') console.log(`${k.padEnd(22)} ${v.toFixed(1)} ms`);
}
