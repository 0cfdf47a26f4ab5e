// Property: random setups drawn from the schema's ranges either fail with a clear error naming a field (at
// validation or beam generation), or track 100 turns without putting NaN or Infinity into the diagnostics or the
// plot data (line density, phase-space histogram, separatrix).
import './fcSeed.ts';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { generateBeam } from '../core/beam/index.ts';
import { computeBucket, separatrix } from '../core/bucket.ts';
import { computeDiagnostics, histogram2d, lineDensity, type TurnDiagnostics } from '../core/diagnostics/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';
import { setupWarnings } from '../core/setup/warnings.ts';
import { Tracker } from '../core/tracker.ts';
import { bucketAt } from '../app/derived.ts';
import { chooseWindow } from '../app/viewWindow.ts';
import { checkParse, EXAMPLES, repairedSetup } from './property-arbitraries.ts';

const TURNS = 100;
const counts = { drawn: 0, invalid: 0, impossible: 0, tracked: 0, allLost: 0, noBucket: 0, degenerateEllipse: 0 };
const reasons = new Map<string, number>();
afterAll(() => {
  console.log(`property-track: ${counts.drawn} setups drawn: ${counts.invalid} refused by validation, ${counts.impossible} refused at beam generation, ` +
    `${counts.tracked} tracked ${TURNS} turns (${counts.noBucket} without a bucket, ${counts.allLost} with every particle lost, ` +
    `${counts.degenerateEllipse} NaN emittance90/95 of a zero-area beam)`);
  console.log(`  beam-generation refusals: ${[...reasons].map(([k, n]) => `${k} ${n}`).join(', ')}`);
});

// A clear error is one line naming a field of the setup, e.g. "beam.distribution.size.value = 5 eV·s: ...".
const NAMES_FIELD = /^[^\n]*\b(particle|ring|energy|rf|beam|run|intensity|impedances|collective|radiation)(\.\w+|\[\d+\])+[^\n]*$/;

// Diagnostics that may be NaN by definition: all of them when no particle is alive, insideFraction without a bucket.
// Known and left to core/diagnostics (counted): emittance90/95 are NaN when the alive particles span no area (one
// particle, or all on a line: zero energy spread), as the rms ellipse they scale is degenerate.
function checkDiagnostics(d: TurnDiagnostics, hasBucket: boolean): void {
  for (const [k, v] of Object.entries(d)) {
    if (k === 'insideFraction' && !hasBucket) continue;
    if ((k === 'emittance90' || k === 'emittance95') && !Number.isFinite(v) && (d.alive === 1 || d.emittanceRms === 0)) {
      counts.degenerateEllipse++;
      continue;
    }
    if (d.alive === 0 && !['turn', 'time', 'alive', 'lost', 'insideFraction'].includes(k)) continue;
    if (!Number.isFinite(v)) throw new Error(`diagnostics.${k} = ${v} at turn ${d.turn} (alive ${d.alive})`);
  }
}

function allFinite(a: ArrayLike<number>, what: string): void {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) throw new Error(`${what}[${i}] = ${a[i]}`);
}

// The example machines with a few numbers rescaled: realistic setups where most particles survive.
const scaledExample = fc.tuple(fc.nat(EXAMPLES.length - 1), fc.array(fc.tuple(fc.nat(), fc.double({ min: -1.5, max: 1.5, noNaN: true })), { minLength: 1, maxLength: 3 }))
  .map(([i, scales]) => {
    const doc = structuredClone(EXAMPLES[i].doc) as { beam: { particles: number }; run: Record<string, unknown> };
    const leaves = numberPaths(doc);
    for (const [k, e] of scales) {
      const p = leaves[k % leaves.length];
      const parent = p.slice(0, -1).reduce((o: any, key) => o[key], doc);
      parent[p[p.length - 1]] *= 10 ** e;
    }
    doc.beam.particles = 200;
    doc.run.turns = TURNS;
    return doc;
  });

function numberPaths(v: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (typeof v === 'number') out.push(prefix);
  else if (Array.isArray(v)) v.slice(0, 3).forEach((x, i) => numberPaths(x, [...prefix, i], out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) numberPaths(x, [...prefix, k], out);
  return out;
}

describe('tracking random valid setups', () => {
  it('examples with numbers rescaled by up to 10^±1.5: 100 turns, or a clear refusal', () => {
    fc.assert(fc.property(scaledExample, (doc) => { counts.drawn++; trackOne(doc); }), { numRuns: 150, interruptAfterTimeLimit: 30_000 });
  }, 120_000);

  it('100 turns: finite diagnostics and plot data, or a clear refusal', () => {
    fc.assert(
      fc.property(repairedSetup, (doc) => {
        counts.drawn++;
        trackOne(doc);
      }),
      // Shrinking a failure re-tracks many setups: stop after a time limit rather than run for minutes.
      { numRuns: 400, interruptAfterTimeLimit: 45_000 },
    );
    expect(counts.tracked).toBeGreaterThan(100);
  }, 120_000);
});

// Validate, generate, track 100 turns and check diagnostics and plot data; impossible setups must say why.
function trackOne(doc: unknown): void {
  const r = parseSetup(doc);
  if (!checkParse(r)) return void counts.invalid++;
  if (!r.ok) return;
  const setup = r.setup;
  for (const w of setupWarnings(setup)) expect(formatIssue(w)).not.toMatch(/\n/);
  let beam;
  try {
    beam = generateBeam(setup, machineAtStart(setup));
  } catch (e) {
    const msg = (e as Error).message;
    if (!(e instanceof Error) || !NAMES_FIELD.test(msg)) throw new Error(`unclear refusal: ${String(msg ?? e)}`);
    counts.impossible++;
    const key = msg.replace(/ = .*?: /, ': ').replace(/^beam\.distribution(\.kind)?: /, '').replace(/[\d.e+-]{3,}/g, '#').slice(0, 70);
    reasons.set(key, (reasons.get(key) ?? 0) + 1);
    return;
  }
  const t = new Tracker(setup, beam.bunch);
  t.track(TURNS);
  counts.tracked++;
  const br = computeBucket(t.machine);
  if (!br.ok) counts.noBucket++;
  const d = computeDiagnostics(t.bunch, t.machine, br.ok ? br.bucket : null, setup.run.profileBins);
  if (d.alive === 0) counts.allLost++;
  checkDiagnostics(d, br.ok);
  // Plot data as the app makes it: the window from the bucket where the tracker is, widened to the beam.
  const view = chooseWindow(bucketAt(setup, { turn: t.turn, time: t.machine.time, pc: t.machine.pc }), d);
  allFinite([view.dtMin, view.dtMax, view.dEMin, view.dEMax], 'view window');
  const profile = new Float64Array(setup.run.profileBins);
  lineDensity(t.bunch, view.dtMin, view.dtMax, profile);
  allFinite(profile, 'lineDensity');
  const hist = new Float32Array(view.nx * view.ny);
  histogram2d(t.bunch, view.dtMin, view.dtMax, view.dEMin, view.dEMax, view.nx, view.ny, hist);
  allFinite(hist, 'histogram2d');
  if (br.ok) {
    const sep = separatrix(t.machine, br.bucket, 200);
    allFinite(sep.dt, 'separatrix dt');
    allFinite(sep.dE, 'separatrix dE');
  }
}
