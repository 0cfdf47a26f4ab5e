// Plain TypeScript turn kernels: the reference and the fallback of the WebAssembly kernels.
// Units: dt in s (dt > 0 = late), dE in eV (PHYSICS.md §4). Per particle, in this order (the wasm kernels do
// the same IEEE operations in the same order, so with sine = 'poly' both give identical bits):
//   kick:   acc = A_0·sin(φ_0 + w_0·dt); acc = acc + A_k·sin(φ_k + w_k·dt) …;  dE = dE + (acc − dEsync)
//   linear: dt = dt + slip·dE
//   exact:  ε = dE/E_s, w = ε(2+ε), u = w/β², s = √max(1+u, 0), D = 1+s, B = (2+ε)·D + u,
//           Q = α0·D² + u·(α1·D + α2·u),  dt = dt + period·(((1+ε)·u)·(Q·B) − (w/(β²γ²))·(D²·D²))/((s·B)·(D²·D))
//           This is PHYSICS.md §3, T/T_s − 1 = [(1+ε)(α0δ+α1δ²+α2δ³) − w/(β²γ²(2+ε+δ))]/(1+δ) with
//           δ = u/D, 1+δ = s (since (1+δ)² = 1+u) and (2+ε+δ) = B/D, over one common denominator:
//           one division instead of three (division and square root share one slow unit). No cancellation
//           beyond the physical one (η). max(…, 0) only guards rounding at the domain edge dE → −(E_s − m),
//           where s → 0 and the drift → +∞ (the particle is then outside any finite dtMax, never NaN).
//           Overflow (hence NaN) needs |dE/E_s| > ~1e50.
//           Where |dE| ≤ reach, the Taylor series of this expression (core/kernels/series.ts, degree 10,
//           truncation below its rounding) replaces it: no square root, no division (driftRelative).
//   loss:   count the particles with !(|dt| ≤ dtMax and dEmin ≤ dE ≤ dEmax) after the pass.
// Hot loops take every parameter as an argument (PERF.md: module-scope reads in the loop halve the speed).
import { DriftSeries } from './series.ts';
import { sinPoly } from './sine.ts';
import { checkInduced, makeInducedParams, type InducedParams } from './induced.ts';
import { checkColumns, checkKick, type DriftParams, type KickParams, type Limits, type TurnKernel } from './types.ts';

type Sine = (x: number) => number;

// Scalars of the exact drift derived once per call, written inline (no object per call):
//   invEs = 1 / Es, invB2 = 1 / beta2, invB2G2 = 1 / beta2 / gamma2   (the same expressions in wasm.ts)

/** The JavaScript kernel; sine = 'poly' (default, same bits as wasm) or 'native' (Math.sin). */
export function createJsKernel(options: { sine?: 'poly' | 'native' } = {}): TurnKernel {
  const sin: Sine = options.sine === 'native' ? Math.sin : sinPoly;
  const scratch = { dt: new Float64Array(1), dE: new Float64Array(1) };
  const series = new DriftSeries();
  const seriesOf = (d: DriftParams): DriftSeries => {
    series.update(d);
    return series;
  };
  const kernel: TurnKernel = {
    impl: 'js',
    allocColumns: (n) => ({ dt: new Float64Array(n), dE: new Float64Array(n) }),
    freeColumns: () => {},
    kickDrift(cols, n, kick, drift, limits) {
      checkColumns(cols, n);
      checkKick(kick);
      const c = kick.count, A = kick.amplitude, w = kick.omega, p = kick.phase;
      const lo = limits.dEmin ?? -limits.dEmax;
      if (drift.kind === 'linear') {
        if (c === 1) return kd1Linear(cols.dt, cols.dE, n, sin, A[0], w[0], p[0], kick.dEsync, drift.slip, limits.dtMax, lo, limits.dEmax);
        if (c === 2) return kd2Linear(cols.dt, cols.dE, n, sin, A[0], w[0], p[0], A[1], w[1], p[1], kick.dEsync, drift.slip, limits.dtMax, lo, limits.dEmax);
        kick4(cols.dt, cols.dE, n, sin, kick);
        return driftLinear(cols.dt, cols.dE, n, drift.slip, limits.dtMax, lo, limits.dEmax);
      }
      const invEs = 1 / drift.Es, invB2 = 1 / drift.beta2, invB2G2 = 1 / drift.beta2 / drift.gamma2;
      const sr = seriesOf(drift);
      if (c === 1) return kd1Exact(cols.dt, cols.dE, n, sin, A[0], w[0], p[0], kick.dEsync, drift.period, sr.reach, sr.b, invEs, invB2, invB2G2, drift.alpha0, drift.alpha1, drift.alpha2, limits.dtMax, lo, limits.dEmax);
      if (c === 2) kick2(cols.dt, cols.dE, n, sin, A[0], w[0], p[0], A[1], w[1], p[1], kick.dEsync);
      else kick4(cols.dt, cols.dE, n, sin, kick);
      return driftExact(cols.dt, cols.dE, n, drift.period, sr.reach, sr.b, invEs, invB2, invB2G2, drift.alpha0, drift.alpha1, drift.alpha2, limits.dtMax, lo, limits.dEmax);
    },
    allocInduced: makeInducedParams,
    freeInduced: () => {},
    kickDriftInduced(cols, n, kick, ind, drift, limits) {
      checkColumns(cols, n);
      checkKick(kick);
      checkInduced(ind);
      return kdInduced(cols.dt, cols.dE, n, sin, kick, ind, drift, drift.kind === 'exact' ? seriesOf(drift) : series, limits);
    },
    kick(cols, n, kick) {
      checkColumns(cols, n);
      checkKick(kick);
      const A = kick.amplitude, w = kick.omega, p = kick.phase;
      if (kick.count === 1) kick1(cols.dt, cols.dE, n, sin, A[0], w[0], p[0], kick.dEsync);
      else if (kick.count === 2) kick2(cols.dt, cols.dE, n, sin, A[0], w[0], p[0], A[1], w[1], p[1], kick.dEsync);
      else kick4(cols.dt, cols.dE, n, sin, kick);
    },
    drift(cols, n, drift, limits) {
      checkColumns(cols, n);
      const lo = limits.dEmin ?? -limits.dEmax;
      if (drift.kind === 'linear') return driftLinear(cols.dt, cols.dE, n, drift.slip, limits.dtMax, lo, limits.dEmax);
      const sr = seriesOf(drift);
      return driftExact(cols.dt, cols.dE, n, drift.period, sr.reach, sr.b, 1 / drift.Es, 1 / drift.beta2, 1 / drift.beta2 / drift.gamma2, drift.alpha0, drift.alpha1, drift.alpha2, limits.dtMax, lo, limits.dEmax);
    },
    syncGain(kick) {
      // The kick of a particle at dt = 0 with dEsync = 0 is exactly the accumulated Σ A_k·sin φ_k.
      scratch.dt[0] = 0;
      scratch.dE[0] = 0;
      const saved = kick.dEsync;
      kick.dEsync = 0;
      kernel.kick(scratch, 1, kick);
      kick.dEsync = saved;
      return scratch.dE[0];
    },
  };
  return kernel;
}

/** T(E_s+dE)/T_s − 1 with one division (formula in the header; the wasm kernels use the same operations). */
export function exactRelative(e: number, invEs: number, invB2: number, invB2G2: number, a0: number, a1: number, a2: number): number {
  const eps = e * invEs;
  const w = eps * (2 + eps);
  const u = w * invB2;
  const s = Math.sqrt(Math.max(1 + u, 0));
  const D = 1 + s;
  const D2 = D * D;
  const B = (2 + eps) * D + u;
  const Q = a0 * D2 + u * (a1 * D + a2 * u);
  return ((1 + eps) * u * (Q * B) - w * invB2G2 * (D2 * D2)) / (s * B * (D2 * D));
}

function kick1(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, a0: number, w0: number, p0: number, sync: number): void {
  for (let i = 0; i < n; i++) dE[i] = dE[i] + (a0 * sin(p0 + w0 * dt[i]) - sync);
}

function kick2(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, a0: number, w0: number, p0: number, a1: number, w1: number, p1: number, sync: number): void {
  for (let i = 0; i < n; i++) {
    const t = dt[i];
    dE[i] = dE[i] + (a0 * sin(p0 + w0 * t) + a1 * sin(p1 + w1 * t) - sync);
  }
}

/**
 * T/T_s − 1 of one particle as the kernels compute it: within its reach the series of series.ts,
 * dE·(b_1 + b_2·dE + … + b_10·dE⁹) by Estrin's scheme (short dependency chains), else exactRelative.
 * The wasm kernels do the same operations per lane.
 */
export function driftRelative(e: number, reach: number, b: Float64Array, invEs: number, invB2: number, invB2G2: number, a0: number, a1: number, a2: number): number {
  if (Math.abs(e) <= reach) {
    const e2 = e * e, e4 = e2 * e2, e8 = e4 * e4;
    return e * ((((b[0] + e * b[1]) + e2 * (b[2] + e * b[3])) + e4 * ((b[4] + e * b[5]) + e2 * (b[6] + e * b[7]))) + e8 * (b[8] + e * b[9]));
  }
  return exactRelative(e, invEs, invB2, invB2G2, a0, a1, a2);
}

// Three or four systems; unused entries (k ≥ count) act as A = w = φ = 0, which adds exactly +0.
function kick4(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, kick: KickParams): void {
  const c = kick.count, A = kick.amplitude, w = kick.omega, p = kick.phase;
  const a0 = A[0], a1 = A[1], a2 = A[2], a3 = c > 3 ? A[3] : 0;
  const w0 = w[0], w1 = w[1], w2 = w[2], w3 = c > 3 ? w[3] : 0;
  const p0 = p[0], p1 = p[1], p2 = p[2], p3 = c > 3 ? p[3] : 0;
  const sync = kick.dEsync;
  for (let i = 0; i < n; i++) {
    const t = dt[i];
    dE[i] = dE[i] + (a0 * sin(p0 + w0 * t) + a1 * sin(p1 + w1 * t) + a2 * sin(p2 + w2 * t) + a3 * sin(p3 + w3 * t) - sync);
  }
}

function driftLinear(dt: Float64Array, dE: Float64Array, n: number, slip: number, dtMax: number, lo: number, hi: number): number {
  let out = 0;
  for (let i = 0; i < n; i++) {
    const e = dE[i];
    const t = dt[i] + slip * e;
    dt[i] = t;
    if (!(Math.abs(t) <= dtMax && e <= hi && e >= lo)) out++;
  }
  return out;
}

function driftExact(dt: Float64Array, dE: Float64Array, n: number, period: number, reach: number, b: Float64Array, invEs: number, invB2: number, invB2G2: number, a0: number, a1: number, a2: number, dtMax: number, lo: number, hi: number): number {
  let out = 0;
  for (let i = 0; i < n; i++) {
    const e = dE[i];
    const t = dt[i] + period * driftRelative(e, reach, b, invEs, invB2, invB2G2, a0, a1, a2);
    dt[i] = t;
    if (!(Math.abs(t) <= dtMax && e <= hi && e >= lo)) out++;
  }
  return out;
}

function kd1Linear(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, a0: number, w0: number, p0: number, sync: number, slip: number, dtMax: number, lo: number, hi: number): number {
  let out = 0;
  for (let i = 0; i < n; i++) {
    let t = dt[i];
    const e = dE[i] + (a0 * sin(p0 + w0 * t) - sync);
    t = t + slip * e;
    dE[i] = e;
    dt[i] = t;
    if (!(Math.abs(t) <= dtMax && e <= hi && e >= lo)) out++;
  }
  return out;
}

function kd2Linear(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, a0: number, w0: number, p0: number, a1: number, w1: number, p1: number, sync: number, slip: number, dtMax: number, lo: number, hi: number): number {
  let out = 0;
  for (let i = 0; i < n; i++) {
    let t = dt[i];
    const e = dE[i] + (a0 * sin(p0 + w0 * t) + a1 * sin(p1 + w1 * t) - sync);
    t = t + slip * e;
    dE[i] = e;
    dt[i] = t;
    if (!(Math.abs(t) <= dtMax && e <= hi && e >= lo)) out++;
  }
  return out;
}

function kd1Exact(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, a0: number, w0: number, p0: number, sync: number, period: number, reach: number, b: Float64Array, invEs: number, invB2: number, invB2G2: number, al0: number, al1: number, al2: number, dtMax: number, lo: number, hi: number): number {
  let out = 0;
  for (let i = 0; i < n; i++) {
    let t = dt[i];
    const e = dE[i] + (a0 * sin(p0 + w0 * t) - sync);
    t = t + period * driftRelative(e, reach, b, invEs, invB2, invB2G2, al0, al1, al2);
    dE[i] = e;
    dt[i] = t;
    if (!(Math.abs(t) <= dtMax && e <= hi && e >= lo)) out++;
  }
  return out;
}

// Kick, induced-voltage kick, drift, deposit (core/kernels/induced.ts), any count of RF systems, either drift.
// Operation for operation as the wasm kdi_* kernels: the RF sum in the same order, the clamp as wasm's pmax/pmin,
// the kick as a + f·d, the deposit in index order.
function kdInduced(dt: Float64Array, dE: Float64Array, n: number, sin: Sine, kick: KickParams, ind: InducedParams, drift: DriftParams, series: DriftSeries, limits: Limits): number {
  const c = kick.count, A = kick.amplitude, w = kick.omega, p = kick.phase, sync = kick.dEsync;
  const linear = drift.kind === 'linear', slip = drift.slip, period = drift.period;
  const invEs = 1 / drift.Es, invB2 = 1 / drift.beta2, invB2G2 = 1 / drift.beta2 / drift.gamma2;
  const al0 = drift.alpha0, al1 = drift.alpha1, al2 = drift.alpha2, reach = series.reach, b = series.b;
  const dtMax = limits.dtMax, hi = limits.dEmax, lo = limits.dEmin ?? -limits.dEmax;
  const inv = ind.inv, y0 = ind.y0, top = 2 * ind.nb + 1, v = ind.volts, cells = ind.cells;
  let out = 0;
  for (let i = 0; i < n; i++) {
    let t = dt[i];
    let acc = A[0] * sin(p[0] + w[0] * t);
    for (let k = 1; k < c; k++) acc = acc + A[k] * sin(p[k] + w[k] * t);
    let e = dE[i] + (acc - sync);
    let y = t * inv - y0;
    let m = 0 < y ? y : 0; // NaN → 0, as wasm's pmax(0, y)
    let j = Math.floor(top < m ? top : m);
    e = e + (v[2 * j] + (y - j) * v[2 * j + 1]);
    t = t + (linear ? slip * e : period * driftRelative(e, reach, b, invEs, invB2, invB2G2, al0, al1, al2));
    dE[i] = e;
    dt[i] = t;
    if (!(Math.abs(t) <= dtMax && e <= hi && e >= lo)) out++;
    y = t * inv - y0;
    m = 0 < y ? y : 0;
    j = Math.floor(top < m ? top : m);
    cells[2 * j] += 1;
    cells[2 * j + 1] += y - j;
  }
  return out;
}
