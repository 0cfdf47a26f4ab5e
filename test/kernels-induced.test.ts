// The induced-voltage stage fused into the turn kernels (core/kernels InducedParams): the js kernel against the
// separate passes it replaces (RF kick, core/collective/lineDensity.ts kickLinear, drift, depositLinear of the
// survivors: independent code), the wasm kernel against the js kernel bit for bit, and the tracker's fused turn
// against its unfused turn. Fictional proton ring (common practice: the kick/drift map of PHYSICS.md §4 with the
// induced kick of §12 between kick and drift): the ring of test/support/kernelRing.ts, h = 8 at 60 kV.
import { describe, expect, it } from 'vitest';
import { makeBunch } from '../core/bunch.ts';
import { depositLinear, kickLinear, type BinGrid } from '../core/collective/lineDensity.ts';
import {
  compactLost, createJsKernel, createWasmKernel, depositLost, foldInduced, makeKickParams, setInducedStage,
  type Columns, type InducedParams, type TurnKernel,
} from '../core/kernels/index.ts';
import { generateBeam } from '../core/beam/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';
import { driftOf, w1 } from './support/kernelRing.ts';

function kickOf(rf: number) {
  const k = makeKickParams();
  k.count = rf;
  for (let j = 0; j < rf; j++) {
    k.amplitude[j] = 60e3 / (j + 1);
    k.omega[j] = (j + 1) * w1;
    k.phase[j] = 0.1 * (j + 1);
  }
  k.dEsync = 4e3;
  return k;
}

// A bunch of ±0.6 rad at h = 8 around the window, some particles outside the window and outside the limits; one
// in 700 with |dE| of 3–5e7 eV, beyond the exact drift's series reach (~2.5e7 eV here): the wasm kernel takes its
// closed-form path for those chunks of 512 and the series alone for the others.
function fill(cols: Columns, n: number, seed: number): void {
  const rng = makeRng(seed);
  for (let i = 0; i < n; i++) {
    cols.dt[i] = (0.3 / w1) * rng.normal();
    cols.dE[i] = i % 700 === 350 ? (i % 1400 === 350 ? 1 : -1) * (3e7 + 2e7 * rng.uniform()) : 1.5e5 * rng.normal();
  }
}

// A window of ±0.7 rad on nb bins and a voltage table (an arbitrary smooth function: the stage only interpolates).
const nb = 61;
const grid: BinGrid = { e0: -0.7 / w1, delta: 1.4 / w1 / nb, nb };
const volts = Float64Array.from({ length: nb }, (_, i) => 2e3 * Math.sin(0.2 * i) - 500);
function stage(kernel: TurnKernel): InducedParams {
  const p = kernel.allocInduced(nb);
  setInducedStage(p, grid.e0, grid.delta, volts, 1);
  return p;
}
const limits = { dtMax: 0.8 / w1, dEmax: 3e5, dEmin: -2.5e5 };

describe('induced-voltage stage in the turn kernels', () => {
  // The stage's half-cell rows give the same piecewise-linear kick as kickLinear's a + f·(b − a) up to rounding
  // (a few ulp of |V| ≤ 2.5 kV), and the same linear weights for the charge.
  it('js: the fused pass equals RF kick, kickLinear, drift and depositLinear of the survivors (to rounding)', () => {
    const js = createJsKernel();
    for (const kind of ['linear', 'exact'] as const) {
      for (const rf of [1, 2, 4]) {
        const n = 4001;
        const a = js.allocColumns(n), b = js.allocColumns(n);
        fill(a, n, rf);
        b.dt.set(a.dt);
        b.dE.set(a.dE);
        const p = stage(js), kick = kickOf(rf), drift = driftOf(kind);
        const outFused = js.kickDriftInduced(a, n, kick, p, drift, limits);
        js.kick(b, n, kick);
        kickLinear(b.dt, b.dE, n, grid, volts);
        const outSep = js.drift(b, n, drift, limits);
        expect(outFused).toBe(outSep);
        expect(outFused).toBeGreaterThan(0); // the case has losses
        for (let i = 0; i < n; i++) {
          expect(Math.abs(a.dE[i] - b.dE[i])).toBeLessThan(1e-12 * 2.5e3 + 1e-15 * Math.abs(b.dE[i]));
          expect(Math.abs(a.dt[i] - b.dt[i])).toBeLessThan(1e-15 * (Math.abs(b.dt[i]) + 1 / w1));
        }
        // The lost particles' deposits come out again (as the tracker does after a pass with losses).
        const aliveFused = compactLost(a, n, limits);
        depositLost(a.dt, aliveFused, n, p);
        const alive = compactLost(b, n, limits);
        expect(aliveFused).toBe(alive);
        const q = new Float64Array(nb), mine = new Float64Array(nb);
        const outsideWindow = depositLinear(b.dt, alive, grid, 1, q);
        const inWindow = foldInduced(p, 1, mine);
        expect(outsideWindow).toBeGreaterThan(0);
        expect(inWindow).toBe(alive - outsideWindow);
        let total = 0;
        for (let i = 0; i < nb; i++) {
          expect(Math.abs(mine[i] - q[i])).toBeLessThan(1e-9);
          total += mine[i];
        }
        expect(total).toBeCloseTo(alive - outsideWindow, 9);
      }
    }
  });

  it('wasm gives the same bits as js (columns, losses, cells), odd and even counts, NaN and huge dt included', () => {
    const js = createJsKernel(), wasm = createWasmKernel();
    for (const n of [0, 1, 2, 7, 1001]) {
      for (const rf of [1, 2, 3, 4]) {
        for (const kind of ['linear', 'exact'] as const) {
          const a = js.allocColumns(n), b = wasm.allocColumns(n);
          fill(a, n, 10 * n + rf);
          if (n >= 7) [a.dt[1], a.dt[4], a.dt[6]] = [NaN, 1e300, -1e300]; // far outside and NaN: rows 0 and 2nb + 1
          b.dt.set(a.dt);
          b.dE.set(a.dE);
          const pa = stage(js), pb = stage(wasm);
          for (let t = 0; t < 20; t++) {
            pa.cells.fill(0);
            pb.cells.fill(0);
            expect(wasm.kickDriftInduced(b, n, kickOf(rf), pb, driftOf(kind), limits)).toBe(js.kickDriftInduced(a, n, kickOf(rf), pa, driftOf(kind), limits));
            expect(pb.cells).toEqual(pa.cells);
          }
          expect(b.dt).toEqual(a.dt);
          expect(b.dE).toEqual(a.dE);
          wasm.freeColumns(b);
          wasm.freeInduced(pb);
        }
      }
    }
  });

  it('wasm: tables stay valid across memory growth and foreign tables are refused', () => {
    const wasm = createWasmKernel();
    const p = stage(wasm);
    const cols = wasm.allocColumns(300_000); // grows the memory
    expect(p.volts[2]).toBe(volts[0]); // row 1: the first outer half bin
    expect(p.volts.buffer).toBe(cols.dt.buffer);
    expect(() => wasm.kickDriftInduced(cols, 10, kickOf(1), stage(createJsKernel()), driftOf('linear'), limits)).toThrow(/allocInduced/);
  });
});

describe('tracker: the induced voltage fused into the kernel pass', () => {
  // Fictional ring with a broad-band resonator and an inductive term, 2e12 protons: a visibly distorted bucket.
  const r = parseSetup({
    version: 1, title: 'test ring (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT: 6 },
    energy: { start: { quantity: 'kinetic', value: 1e9 } }, rf: { systems: [{ harmonic: 8, voltage: 60e3 }] },
    beam: { distribution: { kind: 'matched', shape: 'parabolic', size: { by: 'rmsLength', value: 2e-8 } }, particles: 20000, seed: 3 },
    intensity: { particlesPerBunch: 2e12 },
    impedances: [{ kind: 'resonator', shuntImpedance: 5e3, quality: 1, frequency: 5e8 }, { kind: 'inductive', imZOverN: 10 }],
    collective: { bins: 200, smoothing: 0 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  const setup = r.setup;

  it('follows the unfused turn (separate passes) within rounding over 300 turns, for both kernels', () => {
    for (const kernel of ['wasm', 'js'] as const) {
      const beam = () => generateBeam(setup, machineAtStart(setup)).bunch;
      const fused = new Tracker(setup, beam(), { kernel });
      const apart = new Tracker(setup, beam(), { kernel });
      apart.addElement({ name: 'nothing', apply: () => {} }); // any added element turns the fusion off
      fused.track(300);
      apart.track(300);
      expect(fused.bunch.n).toBe(apart.bunch.n);
      let worst = 0, rms = 0;
      for (let i = 0; i < fused.bunch.n; i++) {
        worst = Math.max(worst, Math.abs(fused.bunch.dt[i] - apart.bunch.dt[i]));
        rms += apart.bunch.dt[i] ** 2;
      }
      rms = Math.sqrt(rms / fused.bunch.n);
      // Only the order of the deposit's sums differs (relative 1e-16 per turn): after 300 regular turns ≪ 1e-9 σ.
      expect(worst / rms).toBeLessThan(1e-9);
      // The kick is real: mean energy change per particle nonzero, and equal in both.
      expect(Math.abs(fused.induced!.meanKick)).toBeGreaterThan(1);
      expect(fused.induced!.meanKick / apart.induced!.meanKick).toBeCloseTo(1, 9);
      expect(fused.induced!.outside).toBe(apart.induced!.outside);
    }
  });

  it('the first fused pass deposits by itself: a fresh tracker gives the reference elements\' kick', () => {
    const beam = generateBeam(setup, machineAtStart(setup)).bunch;
    const copy = makeBunch(beam.total);
    copy.dt.set(beam.dt);
    copy.dE.set(beam.dE);
    const fused = new Tracker(setup, beam, { kernel: 'wasm' });
    const reference = new Tracker(setup, copy, { kernel: 'reference' });
    fused.track(1);
    reference.track(1);
    // Same line density, same V_ind; the kicks differ by the sines only (polynomial vs Math.sin, 5.4e-9 relative).
    expect(fused.induced!.meanKick / reference.induced!.meanKick).toBeCloseTo(1, 6);
  });
});
