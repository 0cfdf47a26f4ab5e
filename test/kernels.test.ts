// Turn kernels (core/kernels): the polynomial sine against Math.sin, the js kernel against an independent
// per-particle loop written here, the exact drift against core/kinematics.ts relativeTimeOfFlight, and the
// WebAssembly SIMD kernel against the js kernel. Fictional proton ring below transition (common practice:
// the kick/drift map of PHYSICS.md §4): 1 GeV kinetic, C = 300 m, γ_t = 6, h = 8 at 60 kV (+ h = 16 at 30 kV).
import { describe, expect, it } from 'vitest';
import { PROTON_MASS_EV } from '../core/constants.ts';
import {
  chooseKernel, compactLost, createJsKernel, createWasmKernel, makeKickParams, sinPoly,
  SIN_POLY_ABS_ERROR, SIN_POLY_MAX_ARG, SIN_POLY_REL_ERROR, type Columns, type KickParams, type TurnKernel,
} from '../core/kernels/index.ts';
import { SIN_COEFFS } from '../core/kernels/sine.ts';
import { driftRelative, exactRelative } from '../core/kernels/js.ts';
import { driftCoefficients, DriftSeries } from '../core/kernels/series.ts';
import { deltaFromDE, relativeTimeOfFlight } from '../core/kinematics.ts';
import { makeRng } from '../core/rng.ts';
import { beta, compaction, driftOf, Es, eta0, gamma, T0, w1 } from './support/kernelRing.ts';

const phiS = Math.asin(5e3 / 60e3); // 5 keV per turn, below transition
const limits = { dtMax: T0 / 2, dEmax: 0.3 * Es };

function kickOf(rf: 1 | 2 | 3 | 4): KickParams {
  const k = makeKickParams();
  k.count = rf;
  const A = [60e3, 30e3, 5e3, 2e3], h = [8, 16, 24, 32], phi = [phiS, 2 * phiS, 3 * phiS + 0.1, 4 * phiS - 0.2];
  for (let j = 0; j < rf; j++) {
    k.amplitude[j] = A[j];
    k.omega[j] = (h[j] / 8) * w1;
    k.phase[j] = phi[j];
  }
  return k;
}

// Small-amplitude bunch: phase amplitude ≤ 0.2 rad of h = 8, dE matched by the linear map (ratio sqrt(K/|c1|)).
function fill(cols: Columns, n: number, seed: number): void {
  const K = 60e3 * w1 * Math.cos(phiS);
  const c1 = Math.abs((T0 * eta0) / (beta ** 2 * Es));
  const rng = makeRng(seed);
  const tMax = 0.2 / w1;
  for (let i = 0; i < n; i++) {
    const a = tMax * Math.sqrt(rng.uniform()), th = 2 * Math.PI * rng.uniform();
    cols.dt[i] = a * Math.cos(th);
    cols.dE[i] = a * Math.sqrt(K / c1) * Math.sin(th);
  }
}

describe('polynomial sine', () => {
  const bound = (x: number) => SIN_POLY_REL_ERROR * Math.abs(Math.sin(x)) + SIN_POLY_ABS_ERROR;

  it('is within its documented error of Math.sin on a dense grid of [−π/2, π/2]', () => {
    let worst = 0;
    let maxRel = 0;
    for (let i = 0; i <= 1_000_000; i++) {
      const x = -Math.PI / 2 + (Math.PI * i) / 1_000_000;
      const e = Math.abs(sinPoly(x) - Math.sin(x));
      worst = Math.max(worst, e / bound(x));
      if (x !== 0) maxRel = Math.max(maxRel, e / Math.abs(Math.sin(x)));
    }
    expect(worst).toBeLessThanOrEqual(1);
    // The Remez fit levels its error at 5.31e-9 (scripts/wasm-sine-remez.ts): the bound is not loose.
    expect(maxRel).toBeGreaterThan(5.2e-9);
  });

  it('keeps that accuracy over |x| < 1e4 rad and up to SIN_POLY_MAX_ARG (range reduction)', () => {
    let worst = 0;
    for (let i = 0; i <= 2_000_000; i++) {
      const x = -1e4 + (2e4 * i) / 2_000_000 + 1e-3 * Math.sin(i); // irregular points
      worst = Math.max(worst, Math.abs(sinPoly(x) - Math.sin(x)) / bound(x));
    }
    for (let k = 1; k < 2 ** 21; k += 4099) // near multiples of π and π/2, where reduction cancels most
      for (const x of [k * Math.PI, k * Math.PI + Math.PI / 2, -k * Math.PI + 1e-9, SIN_POLY_MAX_ARG * (1 - 1e-9)])
        worst = Math.max(worst, Math.abs(sinPoly(x) - Math.sin(x)) / bound(x));
    expect(worst).toBeLessThanOrEqual(1);
  });

  it('is the odd polynomial of SIN_COEFFS on [−π/2, π/2] (no reduction there) and exactly odd', () => {
    const [c1, c3, c5, c7, c9] = SIN_COEFFS;
    for (const x of [1e-300, 1e-8, 0.1, 0.7, 1.2, 1.5, Math.PI / 2 - 1e-12]) {
      const r2 = x * x, r4 = r2 * r2; // evaluated as (c1 + c3 r²) + r⁴·((c5 + c7 r²) + r⁴·c9)
      expect(sinPoly(x)).toBe(x * (c1 + c3 * r2 + r4 * (c5 + c7 * r2 + r4 * c9)));
      expect(sinPoly(-x)).toBe(-sinPoly(x));
    }
    expect(sinPoly(0)).toBe(0);
  });
});

describe('exact drift', () => {
  // Scale of the two terms that cancel in T/T_s − 1 (PHYSICS.md §3), from kinematics.ts: accuracy is relative to it.
  function termScale(dE: number, g: number, b: number, c: typeof compaction): number {
    const eps = dE / (PROTON_MASS_EV * g);
    const d = deltaFromDE(dE, PROTON_MASS_EV * g, b);
    const path = Math.abs((1 + eps) * d * (c.alpha0 + d * (c.alpha1 + d * c.alpha2)));
    return (path + Math.abs((eps * (2 + eps)) / (b * b * g * g * (2 + eps + d)))) / (1 + d);
  }

  // Closer to rest than dE = −0.9 (E_s − m), both formulas lose digits in 1 + u (→ 0), inherited from the input
  // rounding (conditioning, not the formula); the next test covers that edge for NaN.
  it('matches relativeTimeOfFlight within 1e-12 of the term scale, from dE = −0.9 (E_s − m) to dE = 10 E_s', () => {
    for (const g of [1.001, 1.5, 2.06, 6.2, 1e3]) {
      const b = Math.sqrt(1 - 1 / g ** 2);
      const E = PROTON_MASS_EV * g;
      for (const c of [compaction, { alpha0: 1 / 36, alpha1: 0, alpha2: 0 }]) {
        for (let j = -400; j <= 400; j++) {
          if (j === 0) continue;
          const mag = 10 ** (-12 + (11.999 * Math.abs(j)) / 400); // 1e-12 … ~1 of the allowed range
          const dE = j < 0 ? -0.9 * mag * (E - PROTON_MASS_EV) : 10 * mag * E;
          const ref = relativeTimeOfFlight(dE, E, b, g, c);
          const got = exactRelative(dE, 1 / E, 1 / b ** 2, 1 / (b ** 2 * g ** 2), c.alpha0, c.alpha1, c.alpha2);
          expect(Math.abs(got - ref), `γ=${g} dE=${dE}`).toBeLessThanOrEqual(1e-12 * termScale(dE, g, b, c));
        }
      }
    }
  });

  it('never gives NaN inside the domain dE > −(E_s − m); the rest-energy edge is counted as lost', () => {
    for (const kernel of [createJsKernel(), createWasmKernel()]) {
      const d = driftOf('exact');
      const cols = kernel.allocColumns(5);
      const edge = -(Es - PROTON_MASS_EV);
      const dEs = [edge * (1 - 1e-15), edge * (1 - 2 ** -52), edge, 1e40, -1e-300];
      cols.dE.set(dEs);
      const out = kernel.drift(cols, 5, d, { dtMax: Infinity, dEmax: Infinity });
      for (let i = 0; i < 5; i++) expect(Number.isNaN(cols.dt[i]), `${kernel.impl} dE=${dEs[i]}`).toBe(false);
      expect(cols.dt[0]).toBeGreaterThan(0); // nearly at rest: arrives very late
      expect(out).toBe(cols.dt.filter((t) => t === Infinity).length); // only an infinite drift is "outside" here
    }
  });
});

describe('exact drift series (core/kernels/series.ts)', () => {
  // PHYSICS.md §3 [Lee ch. 2–3]: T/T0 − 1 = η0δ + η1δ², η1 = α1 − η0/γ² + 3β²/(2γ²); with δ = √(1+u) − 1,
  // u = ε(2+ε)/β², i.e. δ = ε/β² − ε²/(2β⁴γ²) + O(ε³): c1 = η0/β², c2 = (η1 − η0/(2γ²))/β⁴.
  it('has the first two coefficients of the textbook expansion (1e-13 relative; c1 near transition absolute)', () => {
    const c = new Float64Array(17);
    for (const g of [1.05, 2.066, 5.9, 6.2, 100]) {
      const b2 = 1 - 1 / g ** 2;
      driftCoefficients(c, { beta2: b2, gamma2: g * g, ...compaction });
      const e0 = compaction.alpha0 - 1 / g ** 2;
      const e1 = compaction.alpha1 - e0 / g ** 2 + (3 * b2) / (2 * g ** 2);
      const c2 = (e1 - e0 / (2 * g ** 2)) / b2 ** 2;
      expect(Math.abs(c[1] - e0 / b2)).toBeLessThanOrEqual(1e-15 * (compaction.alpha0 + 1 / g ** 2) / b2); // η0 cancels
      expect(Math.abs(c[2] / c2 - 1), `γ=${g}`).toBeLessThanOrEqual(1e-13);
    }
  });

  // Within its reach the series stands in for the closed form: by construction the neglected terms are below
  // 2^−54 of the first-order scale S·|ε|, S = (|α0| + 1/γ²)/β²; the rest is the rounding of ~30 operations on each
  // side (a few ulp of the terms): 1e-14 of S·|ε|. Checked against relativeTimeOfFlight (core/kinematics.ts).
  it('matches relativeTimeOfFlight within 1e-14 of the first-order scale over its reach, γ from 1.01 to 6000', () => {
    const s = new DriftSeries();
    for (const g of [1.01, 1.5, 2.066, 6.2, 1e3, 6000]) {
      const b = Math.sqrt(1 - 1 / g ** 2), E = PROTON_MASS_EV * g;
      s.update({ Es: E, beta2: b * b, gamma2: g * g, ...compaction });
      const rho = 1 - 1 / g;
      expect(s.reach / E, `γ=${g}`).toBeGreaterThan(rho / 50); // common practice: a bunch spans well under ρ/50
      expect(s.reach / E).toBeLessThanOrEqual(rho / 4);
      const scale = (compaction.alpha0 + 1 / g ** 2) / b ** 2;
      for (let j = -500; j <= 500; j++) {
        const dE = (s.reach * j) / 500;
        const got = driftRelative(dE, s.reach, s.b, 1 / E, 1 / b ** 2, 1 / (b ** 2 * g ** 2), compaction.alpha0, compaction.alpha1, compaction.alpha2);
        const ref = relativeTimeOfFlight(dE, E, b, g, compaction);
        expect(Math.abs(got - ref), `γ=${g} dE=${dE}`).toBeLessThanOrEqual(1e-14 * scale * Math.abs(dE / E));
      }
      // beyond the reach: the closed form itself, bit for bit
      for (const dE of [s.reach * 1.0000001, -s.reach * 3, 0.5 * E]) {
        expect(driftRelative(dE, s.reach, s.b, 1 / E, 1 / b ** 2, 1 / (b ** 2 * g ** 2), compaction.alpha0, compaction.alpha1, compaction.alpha2))
          .toBe(exactRelative(dE, 1 / E, 1 / b ** 2, 1 / (b ** 2 * g ** 2), compaction.alpha0, compaction.alpha1, compaction.alpha2));
      }
    }
  });

  it('wasm and js give the same bits with particles on both sides of the reach, in one pair and apart', () => {
    const d = driftOf('exact'), s = new DriftSeries();
    s.update(d);
    const js = createJsKernel(), wasm = createWasmKernel();
    const n = 1025, a = js.allocColumns(n), b = wasm.allocColumns(n);
    const rng = makeRng(11);
    for (let i = 0; i < n; i++) {
      a.dt[i] = (rng.uniform() - 0.5) * 0.2 / w1;
      // one particle in five beyond the reach (either sign), the others inside; the pattern mixes pairs' lanes
      a.dE[i] = (i % 5 === 3 ? 1.5 : 0.9) * s.reach * (rng.uniform() < 0.5 ? -1 : 1) * (0.5 + 0.5 * rng.uniform());
    }
    b.dt.set(a.dt);
    b.dE.set(a.dE);
    const kick = kickOf(1);
    kick.dEsync = js.syncGain(kick);
    const lim = { dtMax: Infinity, dEmax: Infinity };
    for (let t = 0; t < 5; t++) expect(wasm.kickDrift(b, n, kick, d, lim)).toBe(js.kickDrift(a, n, kick, d, lim));
    expect(b.dt).toEqual(a.dt);
    expect(wasm.drift(b, n, d, lim)).toBe(js.drift(a, n, d, lim));
    expect(b.dt).toEqual(a.dt);
    let beyond = 0;
    for (let i = 0; i < n; i++) if (Math.abs(a.dE[i]) > s.reach) beyond++;
    expect(beyond).toBeGreaterThan(n / 10); // both branches were taken
  });
});

// Independent straightforward map, one particle at a time (Math.sin, kinematics.ts for the exact drift).
function referenceTurns(dt: Float64Array, dE: Float64Array, kick: KickParams, kind: 'linear' | 'exact', turns: number): void {
  const slip = (T0 * eta0) / (beta ** 2 * Es);
  for (let i = 0; i < dt.length; i++) {
    let t = dt[i], e = dE[i];
    for (let n = 0; n < turns; n++) {
      for (let k = 0; k < kick.count; k++) e += kick.amplitude[k] * Math.sin(kick.phase[k] + kick.omega[k] * t);
      e -= kick.dEsync;
      t += kind === 'linear' ? slip * e : T0 * relativeTimeOfFlight(e, Es, beta, gamma, compaction);
    }
    dt[i] = t;
    dE[i] = e;
  }
}

const maxAbs = (a: Float64Array) => a.reduce((m, x) => Math.max(m, Math.abs(x)), 0);

describe('js kernel', () => {
  it('with Math.sin matches the independent per-particle map within 1e-12 (100 turns, 1–4 RF, both drifts)', () => {
    const js = createJsKernel({ sine: 'native' });
    const n = 257;
    for (const rf of [1, 2, 3, 4] as const) {
      for (const kind of ['linear', 'exact'] as const) {
        const kick = kickOf(rf);
        kick.dEsync = 5e3;
        const cols = js.allocColumns(n);
        fill(cols, n, rf);
        const ref = { dt: cols.dt.slice(), dE: cols.dE.slice() };
        referenceTurns(ref.dt, ref.dE, kick, kind, 100);
        for (let t = 0; t < 100; t++) js.kickDrift(cols, n, kick, driftOf(kind), limits);
        const st = maxAbs(ref.dt), se = maxAbs(ref.dE);
        for (let i = 0; i < n; i++) {
          expect(Math.abs(cols.dt[i] - ref.dt[i])).toBeLessThanOrEqual(1e-12 * st);
          expect(Math.abs(cols.dE[i] - ref.dE[i])).toBeLessThanOrEqual(1e-12 * se);
        }
      }
    }
  });
});

describe('wasm kernel', () => {
  it('is chosen under Node 20 (WebAssembly SIMD validates)', () => {
    expect(chooseKernel()).toBe('wasm');
  });

  it('gives the same bits as the js kernel with the polynomial sine (same operations, same order)', () => {
    const js = createJsKernel();
    const wasm = createWasmKernel();
    for (const n of [0, 1, 2, 7, 1001]) {
      for (const rf of [1, 2, 3, 4] as const) {
        for (const kind of ['linear', 'exact'] as const) {
          const a = js.allocColumns(n), b = wasm.allocColumns(n);
          fill(a, n, n + rf);
          b.dt.set(a.dt);
          b.dE.set(a.dE);
          const kick = kickOf(rf);
          kick.dEsync = js.syncGain(kick);
          expect(wasm.syncGain(kick)).toBe(kick.dEsync);
          const lim = { dtMax: 0.15 / w1, dEmax: 2e5, dEmin: -3e5 }; // some particles outside
          for (let t = 0; t < 30; t++) expect(wasm.kickDrift(b, n, kick, driftOf(kind), lim)).toBe(js.kickDrift(a, n, kick, driftOf(kind), lim));
          wasm.kick(b, n, kick);
          js.kick(a, n, kick);
          expect(wasm.drift(b, n, driftOf(kind), lim)).toBe(js.drift(a, n, driftOf(kind), lim));
          expect(b.dt).toEqual(a.dt);
          expect(b.dE).toEqual(a.dE);
          wasm.freeColumns(b);
        }
      }
    }
  });

  // Bound: the two sines differ by at most s = SIN_POLY_REL_ERROR (|sin| ≤ 1, reduction error negligible), so
  // one kick differs by at most δ = 2·ΣA_k·s (the waveform and dEsync = syncGain each differ by ≤ ΣA_k·s).
  // In the normalised coordinates (dt·√K, dE·√|c1|) of the linearised map (K = ΣA_k w_k cos φ_k, c1 = slip)
  // a turn is a rotation, which does not grow an error; so after N turns |ΔdE| ≤ N·δ and
  // |Δdt| ≤ N·δ·√(|c1|/K). A factor 2 covers the non-circular invariant ellipse of the discrete map
  // (relative O((πQ)²), Q ≈ 3e-3) and the amplitude-dependent tune at φ̂ ≤ 0.2 rad (relative φ̂²/16 ≈ 2.5e-3).
  it('agrees with the js kernel using Math.sin after 1000 turns within the bound from the sine accuracy', () => {
    const N = 1000, n = 2001;
    for (const rf of [1, 2] as const) {
      for (const kind of ['linear', 'exact'] as const) {
        const js = createJsKernel({ sine: 'native' }), wasm = createWasmKernel();
        const a = js.allocColumns(n), b = wasm.allocColumns(n);
        fill(a, n, 7);
        b.dt.set(a.dt);
        b.dE.set(a.dE);
        const kick = kickOf(rf);
        const kj = kickOf(rf), kw = kickOf(rf);
        kj.dEsync = js.syncGain(kj);
        kw.dEsync = wasm.syncGain(kw);
        for (let t = 0; t < N; t++) {
          expect(js.kickDrift(a, n, kj, driftOf(kind), limits)).toBe(0);
          expect(wasm.kickDrift(b, n, kw, driftOf(kind), limits)).toBe(0);
        }
        let sumA = 0, K = 0;
        for (let k = 0; k < rf; k++) {
          sumA += kick.amplitude[k];
          K += kick.amplitude[k] * kick.omega[k] * Math.cos(kick.phase[k]);
        }
        const delta = 2 * sumA * SIN_POLY_REL_ERROR;
        const c1 = Math.abs((T0 * eta0) / (beta ** 2 * Es));
        let dEdiff = 0, dtdiff = 0;
        for (let i = 0; i < n; i++) {
          dEdiff = Math.max(dEdiff, Math.abs(a.dE[i] - b.dE[i]));
          dtdiff = Math.max(dtdiff, Math.abs(a.dt[i] - b.dt[i]));
        }
        expect(dEdiff, `${rf} RF ${kind}`).toBeLessThanOrEqual(2 * N * delta);
        expect(dtdiff, `${rf} RF ${kind}`).toBeLessThanOrEqual(2 * N * delta * Math.sqrt(c1 / K));
        expect(dEdiff).toBeGreaterThan(0); // the sines do differ: the comparison is not vacuous
      }
    }
  });

  it('keeps the synchronous particle exactly at the origin (dEsync = syncGain), in the pair loop and the odd tail', () => {
    for (const kernel of [createWasmKernel(), createJsKernel(), createJsKernel({ sine: 'native' })] as TurnKernel[]) {
      for (const rf of [1, 2, 3, 4] as const) {
        for (const kind of ['linear', 'exact'] as const) {
          const n = 5;
          const cols = kernel.allocColumns(n);
          fill(cols, n, 3);
          cols.dt[0] = cols.dE[0] = 0; // in a SIMD pair
          cols.dt[4] = cols.dE[4] = 0; // the odd last particle
          const kick = kickOf(rf);
          kick.dEsync = kernel.syncGain(kick);
          for (let t = 0; t < 1000; t++) kernel.kickDrift(cols, n, kick, driftOf(kind), limits);
          for (const i of [0, 4]) {
            expect(cols.dt[i], `${kernel.impl} ${rf} RF ${kind}`).toBe(0);
            expect(cols.dE[i]).toBe(0);
          }
          expect(cols.dE[1]).not.toBe(0); // the others do move
        }
      }
    }
  });

  it('counts particles outside the limits (NaN included) and compactLost moves exactly those behind the alive block', () => {
    const wasm = createWasmKernel();
    const n = 11;
    const cols = wasm.allocColumns(n);
    const lim = { dtMax: 1e-9, dEmax: 1e5, dEmin: -2e5 };
    const dts = [0, 2e-9, 0, 0, -1.5e-9, 0, NaN, 0, 0, 0, 5e-10];
    const dEs = [0, 0, 1.5e5, -1.5e5, 0, -2.5e5, 0, 0, 0, 0, 2e5];
    cols.dt.set(dts);
    cols.dE.set(dEs);
    const outside = dts.filter((t, i) => !(Math.abs(t) <= lim.dtMax && dEs[i] <= lim.dEmax && dEs[i] >= lim.dEmin)).length;
    expect(outside).toBe(6);
    const d = driftOf('linear');
    d.slip = 0; // leaves the coordinates as they are
    expect(wasm.drift(cols, n, d, lim)).toBe(outside);
    const alive = compactLost(cols, n, lim);
    expect(alive).toBe(n - outside);
    for (let i = 0; i < n; i++) {
      const inside = Math.abs(cols.dt[i]) <= lim.dtMax && cols.dE[i] <= lim.dEmax && cols.dE[i] >= lim.dEmin;
      expect(inside).toBe(i < alive);
    }
    expect(wasm.drift(cols, alive, d, lim)).toBe(0);
  });

  it('keeps columns valid across memory growth, reuses freed space and rejects foreign arrays', () => {
    const wasm = createWasmKernel();
    const small = wasm.allocColumns(3);
    small.dt.set([1, 2, 3]);
    const old = small.dt;
    const big = wasm.allocColumns(300_000); // grows the memory: earlier views detach
    expect(old.length).toBe(0);
    expect(Array.from(small.dt)).toEqual([1, 2, 3]); // re-pointed in place
    expect(big.dt.buffer).toBe(small.dt.buffer);
    const offset = big.dt.byteOffset;
    wasm.freeColumns(big);
    expect(wasm.allocColumns(1000).dt.byteOffset).toBe(offset);
    expect(() => wasm.kick({ dt: new Float64Array(4), dE: new Float64Array(4) }, 4, kickOf(1))).toThrow(/allocColumns/);
    expect(() => wasm.kick(small, 4, kickOf(1))).toThrow(/\[0, 3\]/);
  });
});

describe('wasm kernel, asynchronous creation (for a page main thread)', () => {
  it('createWasmKernelAsync gives a kernel with the same bits as the synchronous one', async () => {
    const { createWasmKernelAsync } = await import('../core/kernels/index.ts');
    const a = await createWasmKernelAsync(), b = createWasmKernel();
    const ca = a.allocColumns(9), cb = b.allocColumns(9);
    fill(ca, 9, 5);
    cb.dt.set(ca.dt);
    cb.dE.set(ca.dE);
    const kick = kickOf(2);
    kick.dEsync = a.syncGain(kick);
    for (let t = 0; t < 10; t++) expect(a.kickDrift(ca, 9, kick, driftOf('exact'), limits)).toBe(b.kickDrift(cb, 9, kick, driftOf('exact'), limits));
    expect(ca.dt).toEqual(cb.dt);
    expect(ca.dE).toEqual(cb.dE);
    expect(ca.dt[1]).not.toBe(0);
  });
});
