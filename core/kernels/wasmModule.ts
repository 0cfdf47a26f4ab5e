// Generator of the WebAssembly SIMD (f64x2) turn kernels: this TypeScript is the source of truth, and the binary
// is assembled from it at load time (~26 kB, ~10 ms once per process), so nothing binary is committed and there is no
// build step (`npm ci` + `npm test` need nothing beyond Node).
// Units as in core/kernels/js.ts; the per-particle operations and their order are exactly those of js.ts with the
// polynomial sine of sine.ts, two particles per instruction, so the two agree bit for bit.
//
// Module layout: imports env.memory (shared or not); every exported function has the type
// (dtPtr, dEPtr, n: i32) → i32 (byte addresses of the columns) and reads its parameters from the block at
// byte 0 (PARAM below), written by core/kernels/wasm.ts before each call.
//   kick_<k>            k = 1..4 RF systems, returns 0
//   drift_linear/exact  returns the number of particles outside the limits
//   kd_linear_<k>, kd_exact_<k>   fused kick + drift, returns the number outside the limits
//   kdi_linear_<k>, kdi_exact_<k> the same with the induced-voltage stage (kick, then deposit after the drift;
//                       core/kernels/induced.ts)
// Pairs [2j, 2j+1] run through v128 loads/stores (the RF kicks two pairs per iteration); an odd last particle goes
// through the same code with v128.load64_zero / v128.store64_lane, so the particle at index n (a lost one) is never
// touched.
// The loss count: the lane mask of "inside" (all ones) is subtracted from an i64x2 counter, no branch.
import { INV_PI, PI_HI, PI_LO, ROUND_MAGIC, SIN_COEFFS } from './sine.ts';

/**
 * Byte offsets (from 0) of the parameter block, all f64. A, W, PHI hold MAX_RF = 4 entries each. The kernels
 * read every parameter in the loop with v128.load64_splat (one movddup from L1), and write the numeric
 * constants as v128.const, which V8 hoists into registers: this keeps the live set small (parameters splatted
 * into locals before the loop were spilled and reloaded through extra address registers).
 */
export const PARAM = {
  A: 0, W: 32, PHI: 64, SYNC: 96, SLIP: 104, PERIOD: 112, INV_ES: 120, INV_B2: 128, INV_B2G2: 136,
  AL0: 144, AL1: 152, AL2: 160, DT_MAX: 168, DE_MIN: 176, DE_MAX: 184,
  IND_INV: 192, IND_Y0: 200, IND_TOP: 208, // induced stage: f64 (TOP = 2nb + 1, the last row)
  IND_VKEY: 216, IND_CKEY: 224, // induced stage: f64 row keys of the tables (rowKey below)
  SERIES_REACH: 240, SERIES: 248, // exact drift's series (core/kernels/series.ts): reach [eV], then b_1 … b_DEGREE
  ZERO_I32: 440, // an i32 0 read at entry as the base address of the block
} as const;
/** Two scratch particles (dt at SCRATCH, dE at SCRATCH + 16) used by syncGain. */
export const SCRATCH = 448;
/** First byte available to particle columns. */
export const HEAP_BASE = 512;

/**
 * Row key of an induced-stage table at byteOffset: for a row number j (a small integer held as f64), the f64 sum
 * j + key has 16j + byteOffset, the row's byte address, in its low 32 bits: the key is 1.5·2^48 + byteOffset/16,
 * where the spacing of f64 values is 1/16, so the sum is exact and its mantissa counts sixteenths.
 */
export const rowKey = (byteOffset: number): number => 1.5 * 2 ** 48 + byteOffset / 16;

/** Particles per chunk of the split kick-then-drift loop (2 × 8 kB of columns: stays in L1). */
const CHUNK = 512;

export type DriftKind = 'none' | 'linear' | 'exact';

/** Exported function name for a kick of `rf` systems (0 = none) followed by a drift of `drift` kind. */
export function kernelName(rf: number, drift: DriftKind, induced = false): string {
  if (induced) return `kdi_${drift}_${rf}`;
  if (drift === 'none') return `kick_${rf}`;
  return rf === 0 ? `drift_${drift}` : `kd_${drift}_${rf}`;
}

// Code is a tree of bytes, flattened once per section: spreading at every nesting level copied quadratically.
type Code = (number | Code)[];
const flat = (c: Code): number[] => c.flat(Infinity as 1) as number[];

function uleb(v: number): number[] {
  const out: number[] = [];
  do {
    let b = v & 0x7f;
    v >>>= 7;
    if (v !== 0) b |= 0x80;
    out.push(b);
  } while (v !== 0);
  return out;
}

function sleb(v: number): number[] {
  const out: number[] = [];
  for (;;) {
    const b = v & 0x7f;
    v >>= 7;
    if ((v === 0 && (b & 0x40) === 0) || (v === -1 && (b & 0x40) !== 0)) return [...out, b];
    out.push(b | 0x80);
  }
}

/** v128.const holding x in both lanes (little-endian f64 bytes). */
const splat = (x: number): Code => [...simd(0x0c), ...new Uint8Array(new Float64Array([x, x]).buffer)];
const str = (s: string): Code => [uleb(s.length), [...s].map((ch) => ch.charCodeAt(0))];
const vec = (items: Code[]): Code => [uleb(items.length), items];
const section = (id: number, body: Code): Code => {
  const bytes = flat(body);
  return [id, uleb(bytes.length), bytes];
};

// --- instructions (names as in the WebAssembly text format) ---
const I32 = 0x7f, V128 = 0x7b;
const simd = (op: number): Code => [0xfd, uleb(op)];
const get = (l: number): Code => [0x20, uleb(l)];
const set = (l: number, v: Code): Code => [v, 0x21, uleb(l)];
const i32c = (v: number): Code => [0x41, sleb(v)];
const bin = (op: Code) => (a: Code, b: Code): Code => [a, b, op];
const un = (op: Code) => (a: Code): Code => [a, op];
const f64x2 = {
  max: bin(simd(0xf5)), pmin: bin(simd(0xf6)), pmax: bin(simd(0xf7)), floor: un(simd(0x75)), abs: un(simd(0xec)), sqrt: un(simd(0xef)), nearest: un(simd(0x94)),
  add: bin(simd(0xf0)), sub: bin(simd(0xf1)), mul: bin(simd(0xf2)), div: bin(simd(0xf3)),
  gt: bin(simd(0x4a)), le: bin(simd(0x4b)), ge: bin(simd(0x4c)),
};
const v128and = bin(simd(0x4e));
const v128xor = bin(simd(0x51));
const v128or = bin(simd(0x50));
const anyTrue = (a: Code): Code => [a, simd(0x53)]; // v128.any_true
const bitselect = (a: Code, b: Code, mask: Code): Code => [a, b, mask, simd(0x52)]; // a where mask, else b
const allTrue = (a: Code): Code => [a, simd(0xc3)]; // i64x2.all_true
const i64x2shl = (a: Code, bits: number): Code => [a, i32c(bits), simd(0xcb)];
const i64x2sub = bin(simd(0xd1));
const i64x2lane = (a: Code, lane: number): Code => [a, simd(0x1d), lane];
const i32 = { add: bin([0x6a]), sub: bin([0x6b]), and: bin([0x71]), shl: bin([0x74]), ltu: bin([0x49]), wrapI64: un([0xa7]) };
const v128load = (addr: Code): Code => [addr, simd(0x00), 4, 0];
const v128store = (addr: Code, v: Code): Code => [addr, v, simd(0x0b), 4, 0];
const v128loadAt = (addr: Code, offset: number): Code => [addr, simd(0x00), 4, uleb(offset)];
const v128storeAt = (addr: Code, v: Code, offset: number): Code => [addr, v, simd(0x0b), 4, uleb(offset)];
const load64zero = (addr: Code): Code => [addr, simd(0x5d), 3, 0];
const shuffle = (a: Code, b: Code, lanes: number[]): Code => [a, b, simd(0x0d), lanes];
const LO_LANES = [0, 1, 2, 3, 4, 5, 6, 7], HI_LANES = [8, 9, 10, 11, 12, 13, 14, 15];
const plus16 = (l: number[]) => l.map((x) => x + 16);
const i32x4 = { lane: (a: Code, j: number): Code => [a, simd(0x1b), j] };
const store64lane0 = (addr: Code, v: Code): Code => [addr, v, simd(0x5b), 3, 0, 0];

// One kernel function. Locals: params 0..2, then i32 locals, then v128 locals (declared in that order).
function kernelBody(rf: number, drift: DriftKind, induced = false): Code {
  const DT = 0, DE = 1, N = 2;
  let next = 3;
  const PT = next++, PE = next++, PEND = next++, TAIL = next++, BASE = next++, QT = next++, QE = next++, CEND = next++; // i32
  const ADDR = next++; // i32, induced stage
  const nI32 = next - 3;
  const firstV = next;
  const v = () => next++;
  const T = v(), E = v(), X = v(), K = v(), KB = v(), R = v(), R2 = v(), ACC = v(), MASK = v(), CNT = v();
  const EPS = v(), WW = v(), DELTA = v();
  const T2 = v(), E2 = v(), X2 = v(), K2 = v(), KB2 = v(), R_2 = v(), R22 = v(), ACC2 = v(), MASK2 = v(); // second pair
  const XI = v(), KI = v(), FI = v(), LA = v(), LB = v(), KV = v(); // induced stage
  const XI2 = v(), KI2 = v(), FI2 = v(), LA2 = v(), LB2 = v(), KV2 = v(); // its second pair
  const VINV = v(), VY0 = v(), VTOP = v(), VKEY = v(); // the induced kick's grid, held from the function's entry
  const CKEY = v(); // the cells' row key, held in the drift and deposit loops
  const BEYOND = v(); // exact drift: lanes of the chunk beyond the series' reach (all ones), after the kicks
  const nV128 = next - firstV;
  const { add, sub, mul, div } = f64x2;
  const g = get;
  const P = (offset: number): Code => [get(BASE), simd(0x0a), 3, uleb(offset)]; // v128.load64_splat
  const ZERO = splat(0), ONE = splat(1), TWO = splat(2), MAGIC = splat(ROUND_MAGIC), INVPI = splat(INV_PI), PIHI = splat(PI_HI), PILO = splat(PI_LO);
  const C = SIN_COEFFS.map(splat);
  const A = (k: number) => P(PARAM.A + 8 * k), W = (k: number) => P(PARAM.W + 8 * k), PH = (k: number) => P(PARAM.PHI + 8 * k);
  const SYNC = P(PARAM.SYNC), SLIP = P(PARAM.SLIP), PERIOD = P(PARAM.PERIOD), INVES = P(PARAM.INV_ES), INVB2 = P(PARAM.INV_B2);
  const INVB2G2 = P(PARAM.INV_B2G2), AL0 = P(PARAM.AL0), AL1 = P(PARAM.AL1), AL2 = P(PARAM.AL2);
  const DTMAX = P(PARAM.DT_MAX), DEMIN = P(PARAM.DE_MIN), DEMAX = P(PARAM.DE_MAX);
  const setup: Code[] = [set(BASE, [i32c(0), 0x28, 2, uleb(PARAM.ZERO_I32)])]; // i32.load

  // Induced stage (core/kernels/induced.ts): y = dt·inv − y0 of the pair in T; row j = ⌊clamp(y, 0, 2nb+1)⌋;
  // j + key (rowKey) leaves the row's byte address in i32 lanes 0 and 2; f = y − j. The clamp's operand order sends
  // NaN to 0 (pmax(0, y) = 0 < y ? y : 0): every row is in the tables.
  interface RowLocals { T: number; E: number; XI: number; KI: number; FI: number; LA: number; LB: number; KV: number }
  const R1: RowLocals = { T, E, XI, KI, FI, LA, LB, KV };
  // The grid's parameters come from the block (P, the odd last particle's deposit) or from locals: the kick's for the
  // whole call, the deposit's set before its loop (held).
  interface Grid { inv: Code; y0: Code; top: Code; key: Code }
  const gridOf = (key: number): Grid => ({ inv: P(PARAM.IND_INV), y0: P(PARAM.IND_Y0), top: P(PARAM.IND_TOP), key: P(key) });
  const rowPair = (L: RowLocals, q: Grid): Code[] => [
    set(L.XI, sub(mul(g(L.T), q.inv), q.y0)),
    set(L.FI, f64x2.floor(f64x2.pmin(f64x2.pmax(ZERO, g(L.XI)), q.top))),
    set(L.KI, add(g(L.FI), q.key)),
    set(L.FI, sub(g(L.XI), g(L.FI))),
  ];
  // dE += a_j + f·d_j: one aligned load per particle, lanes regrouped into (a0, a1) and (d0, d1).
  const inducedKickOps = (L: RowLocals): Code[] => [
    ...rowPair(L, { inv: g(VINV), y0: g(VY0), top: g(VTOP), key: g(VKEY) }),
    set(L.LA, v128load(i32x4.lane(g(L.KI), 0))),
    set(L.LB, v128load(i32x4.lane(g(L.KI), 2))),
    set(L.KV, shuffle(g(L.LA), g(L.LB), [...LO_LANES, ...plus16(LO_LANES)])),
    set(L.LB, shuffle(g(L.LA), g(L.LB), [...HI_LANES, ...plus16(HI_LANES)])),
    set(L.E, add(g(L.E), add(g(L.KV), mul(g(L.FI), g(L.LB))))),
  ];
  const inducedKick = inducedKickOps(R1);
  const inducedKick2 = inducedKickOps({ T: T2, E: E2, XI: XI2, KI: KI2, FI: FI2, LA: LA2, LB: LB2, KV: KV2 });
  // cells[j] += (1, f); lane 0 then lane 1 (they may share a row).
  const depositLane = (j: number): Code[] => [
    set(ADDR, i32x4.lane(g(KI), 2 * j)),
    v128store(g(ADDR), add(v128load(g(ADDR)), shuffle(ONE, g(FI), [...LO_LANES, ...plus16(j === 0 ? LO_LANES : HI_LANES)]))),
  ];
  const deposit = (tail: boolean, q = gridOf(PARAM.IND_CKEY)): Code[] => [...rowPair(R1, q), ...depositLane(0), ...(tail ? [] : depositLane(1))];
  // The drift loop (linear) and the deposit loop (after the exact drift) hold the grid in locals the kick uses (few
  // values live there, so they stay in registers: 8–15 % less than splatting them from the block per pair).
  const held: Grid = { inv: g(LA), y0: g(LB), top: g(KV), key: g(CKEY) };
  const holdGrid: Code[] = [set(LA, P(PARAM.IND_INV)), set(LB, P(PARAM.IND_Y0)), set(KV, P(PARAM.IND_TOP)), set(CKEY, P(PARAM.IND_CKEY))];

  // The map for the two particles in T, E (as sinPoly and js.ts, operation for operation).
  interface KickLocals { T: number; E: number; X: number; K: number; KB: number; R: number; R2: number; ACC: number }
  const kickOps = (L: KickLocals): Code[] => {
    const body: Code[] = [];
    for (let k = 0; k < rf; k++) {
      body.push(
        set(L.X, add(PH(k), mul(W(k), g(L.T)))), // x = φ_k + w_k·dt
        // x/π + 1.5·2^52 rounds x/π to the nearest integer k (ties to even) and leaves k in the low mantissa bits
        set(L.KB, add(mul(g(L.X), INVPI), MAGIC)),
        set(L.K, sub(g(L.KB), MAGIC)),
        set(L.R, sub(sub(g(L.X), mul(g(L.K), PIHI)), mul(g(L.K), PILO))), // r = x − k·P1 − k·P2
        set(L.R, v128xor(g(L.R), i64x2shl(g(L.KB), 63))), // r·(−1)^k: the parity bit of k moved to the sign bit
        set(L.R2, mul(g(L.R), g(L.R))),
      );
      // Estrin's scheme: (c1 + c3 r²) + r⁴·((c5 + c7 r²) + r⁴·c9), a shorter dependency chain than Horner's
      body.push(set(L.K, mul(g(L.R2), g(L.R2)))); // r⁴ (k is no longer needed)
      const r4 = g(L.K);
      const poly = add(add(C[0], mul(C[1], g(L.R2))), mul(r4, add(add(C[2], mul(C[3], g(L.R2))), mul(r4, C[4]))));
      const term = mul(A(k), mul(g(L.R), poly));
      body.push(set(L.ACC, k === 0 ? term : add(g(L.ACC), term)));
    }
    if (rf > 0) body.push(set(L.E, add(g(L.E), sub(g(L.ACC), SYNC))));
    return body;
  };
  const kickBody = kickOps({ T, E, X, K, KB, R, R2, ACC });
  // the second pair of the two-pair loops (pairs2Loop, kickPass2)
  const kick2 = kickOps({ T: T2, E: E2, X: X2, K: K2, KB: KB2, R: R_2, R2: R22, ACC: ACC2 });
  // all ones where |dt| ≤ dtMax and dEmin ≤ dE ≤ dEmax (NaN: zeros)
  const limitsOf = (t: number, e: number) => v128and(v128and(f64x2.le(f64x2.abs(g(t)), DTMAX), f64x2.le(g(e), DEMAX)), f64x2.ge(g(e), DEMIN));
  const drift2 = drift === 'linear' ? [set(T2, add(g(T2), mul(SLIP, g(E2)))), set(MASK2, limitsOf(T2, E2))] : [];
  const limitsMask = limitsOf(T, E);
  // The drift of the pair in T, E; withClosedForm = false: the series alone (the chunk is within its reach).
  const driftOf = (withClosedForm: boolean): Code[] => {
  const body: Code[] = [];
  if (drift === 'linear') body.push(set(T, add(g(T), mul(SLIP, g(E)))));
  if (drift === 'exact') {
    // The series where |dE| ≤ reach (core/kernels/series.ts): dE·(b_1 + b_2·dE + … + b_10·dE⁹). When a lane
    // is beyond the reach, the closed form for the pair, and each lane keeps its own (as js.ts per particle):
    // ε, w = ε(2+ε), u = w/β², s = √max(1+u, 0), D = 1+s, B = (2+ε)D + u, Q = α0D² + u(α1D + α2u),
    // T/T_s − 1 = ((1+ε)·u·Q·B − (w/(β²γ²))·D⁴)/(s·D³·B)   (one division: see js.ts)
    const S = K, D = KB, D2 = R, B = R2, Q = ACC;
    // Estrin's scheme, as driftRelative (js.ts): short dependency chains instead of Horner's ten steps
    const b = (k: number) => P(PARAM.SERIES + 8 * k), E2 = EPS, E4 = WW, E8 = X;
    const pair = (k: number) => add(b(k), mul(g(E), b(k + 1)));
    body.push(
      set(E2, mul(g(E), g(E))), set(E4, mul(g(E2), g(E2))), set(E8, mul(g(E4), g(E4))),
      set(DELTA, mul(g(E), add(
        add(add(pair(0), mul(g(E2), pair(2))), mul(g(E4), add(pair(4), mul(g(E2), pair(6))))),
        mul(g(E8), pair(8))))),
    );
    if (withClosedForm) body.push(
      set(MASK, f64x2.le(f64x2.abs(g(E)), P(PARAM.SERIES_REACH))),
      [...allTrue(g(MASK)), 0x45, 0x04, 0x40], // if not both lanes within reach
      set(EPS, mul(g(E), INVES)),
      set(WW, mul(g(EPS), add(TWO, g(EPS)))),
      set(X, mul(g(WW), INVB2)), // u
      set(S, f64x2.sqrt(f64x2.max(add(ONE, g(X)), ZERO))),
      set(D, add(ONE, g(S))),
      set(D2, mul(g(D), g(D))),
      set(B, add(mul(add(TWO, g(EPS)), g(D)), g(X))),
      set(Q, add(mul(AL0, g(D2)), mul(g(X), add(mul(AL1, g(D)), mul(AL2, g(X)))))),
      set(DELTA, bitselect(g(DELTA), div( // products paired as a tree: a shorter dependency chain
        sub(mul(mul(add(ONE, g(EPS)), g(X)), mul(g(Q), g(B))), mul(mul(g(WW), INVB2G2), mul(g(D2), g(D2)))),
        mul(mul(g(S), g(B)), mul(g(D2), g(D)))), g(MASK))),
      [0x0b], // end if
    );
    body.push(set(T, add(g(T), mul(PERIOD, g(DELTA)))));
  }
  if (drift !== 'none') body.push(set(MASK, limitsMask));
  return body;
  };
  const driftBody = driftOf(true);

  const kickLoop = [...kickBody, ...(induced ? inducedKick : [])], kickLoop2 = [...kick2, ...(induced ? inducedKick2 : [])];
  const driftLoop = [...driftBody, ...(induced ? deposit(false) : [])], driftTail = [...driftBody, ...(induced ? deposit(true) : [])];
  const counting = drift !== 'none';
  const step = (p: number): Code => set(p, i32.add(g(p), i32c(16)));
  // while (pt < pend): one pair, kick and drift together
  const fusedLoop: Code[] = [
    [0x02, 0x40, ...i32.ltu(g(PT), g(PEND)), 0x45, 0x0d, 0, 0x03, 0x40], // block; br_if 0 (!(pt<pend)); loop
    set(T, v128load(g(PT))), set(E, v128load(g(PE))),
    ...kickLoop, ...driftLoop,
    v128store(g(PT), g(T)), v128store(g(PE), g(E)),
    counting ? set(CNT, i64x2sub(g(CNT), g(MASK))) : [],
    step(PT), step(PE),
    [...i32.ltu(g(PT), g(PEND)), 0x0d, 0, 0x0b, 0x0b], // br_if 0 (loop); end loop; end block
  ];
  // One RF system with the linear drift, or kicks alone: two pairs per iteration, their statements alternated (two
  // independent chains side by side: +13 % here), until fewer than two pairs remain; fusedLoop takes the last pair.
  const body1 = [...kickBody, ...driftBody], body2 = [...kick2, ...drift2];
  const pairs2Loop: Code[] = [
    [0x02, 0x40, 0x03, 0x40], // block; loop: while two pairs remain
    [...i32.ltu(i32.add(g(PT), i32c(16)), g(PEND)), 0x45, 0x0d, 1],
    set(T, v128load(g(PT))), set(E, v128load(g(PE))), set(T2, v128loadAt(g(PT), 16)), set(E2, v128loadAt(g(PE), 16)),
    ...body1.flatMap((op, i) => [op, body2[i]]),
    v128store(g(PT), g(T)), v128store(g(PE), g(E)), v128storeAt(g(PT), g(T2), 16), v128storeAt(g(PE), g(E2), 16),
    counting ? set(CNT, i64x2sub(i64x2sub(g(CNT), g(MASK)), g(MASK2))) : [],
    set(PT, i32.add(g(PT), i32c(32))), set(PE, i32.add(g(PE), i32c(32))),
    [0x0c, 0, 0x0b, 0x0b],
  ];
  const twoPairs = rf > 0 && drift !== 'exact' && !induced; // in effect one RF system: more go through splitLoop
  // Chunks of CHUNK particles (in L1): all kicks of the chunk (with an induced stage, its kick right after the RF
  // kick in the same pass: 8–12 % less than a pass of its own), then all drifts, and the deposits (in the drift's
  // loop after a linear drift, in their own after the exact one).
  // The exact drift's sqrt and division, two or more sines, and the induced stage's table look-ups make long
  // dependency chains; fused into one body, too few pairs fit the out-of-order window (2 RF, linear: +20 %).
  const split = rf > 0 && (drift === 'exact' || induced || rf > 1); // one RF + linear drift: fused is as fast
  const depositInDrift = induced && drift === 'linear'; // short enough together; after the exact drift, apart
  // The RF kicks of a chunk, two pairs at a time as above (+5–10 %), then a last pair if one is left.
  const kickPass2 = (body1: Code[], body2: Code[]): Code[] => [
    set(QT, g(PT)), set(QE, g(PE)),
    [0x02, 0x40, 0x03, 0x40],
    [...i32.ltu(i32.add(g(QT), i32c(16)), g(CEND)), 0x45, 0x0d, 1],
    set(T, v128load(g(QT))), set(E, v128load(g(QE))), set(T2, v128loadAt(g(QT), 16)), set(E2, v128loadAt(g(QE), 16)),
    ...body1.flatMap((op, i) => [op, body2[i]]),
    v128store(g(QE), g(E)), v128storeAt(g(QE), g(E2), 16),
    set(QT, i32.add(g(QT), i32c(32))), set(QE, i32.add(g(QE), i32c(32))),
    [0x0c, 0, 0x0b, 0x0b],
    [...i32.ltu(g(QT), g(CEND)), 0x04, 0x40],
    set(T, v128load(g(QT))), set(E, v128load(g(QE))),
    ...body1,
    v128store(g(QE), g(E)),
    [0x0b],
  ];
  // Exact drift with an induced stage: the kick pass notes whether any kicked dE of the chunk is beyond the series'
  // reach (NaN is not: the series gives NaN as the closed form would). Usually none is, and the chunk's drift is the
  // series alone, without the per-pair test and its branch: the induced stage costs 5–15 % less (paired runs). The
  // deposit stays in its own loop: in the drift's loop it made the stage ~1.5× slower.
  // (Without an induced stage the branch costs nothing measurable.)
  const beyondOf = (e: number): Code => set(BEYOND, v128or(g(BEYOND), f64x2.gt(f64x2.abs(g(e)), P(PARAM.SERIES_REACH))));
  const exactFast = drift === 'exact' && induced;
  const seriesLoop: Code[] = [
    [0x03, 0x40], // loop $series
    set(T, v128load(g(QT))), set(E, v128load(g(QE))),
    ...driftOf(false),
    v128store(g(QT), g(T)),
    set(CNT, i64x2sub(g(CNT), g(MASK))),
    step(QT), step(QE),
    [...i32.ltu(g(QT), g(CEND)), 0x0d, 0, 0x0b], // br_if $series; end
  ];
  const driftPass: Code[] = [
    ...(depositInDrift ? holdGrid : []),
    [0x03, 0x40], // loop $drift
    set(T, v128load(g(QT))), set(E, v128load(g(QE))),
    ...driftBody,
    ...(depositInDrift ? deposit(false, held) : []),
    v128store(g(QT), g(T)),
    set(CNT, i64x2sub(g(CNT), g(MASK))),
    step(QT), step(QE),
    [...i32.ltu(g(QT), g(CEND)), 0x0d, 0, 0x0b], // br_if $drift; end
  ];
  const splitLoop: Code[] = [
    [0x02, 0x40, 0x03, 0x40], // block $done; loop $chunk
    [...i32.ltu(g(PT), g(PEND)), 0x45, 0x0d, 1], // br_if $done (!(pt < pend))
    set(CEND, [...i32.add(g(PT), i32c(8 * CHUNK)), ...g(PEND), ...i32.ltu(i32.add(g(PT), i32c(8 * CHUNK)), g(PEND)), 0x1b]), // min
    ...(exactFast ? [set(BEYOND, ZERO), ...kickPass2([...kickLoop, beyondOf(E)], [...kickLoop2, beyondOf(E2)])] : kickPass2(kickLoop, kickLoop2)),
    set(QT, g(PT)), set(QE, g(PE)),
    ...(exactFast ? [[...anyTrue(g(BEYOND)), 0x45, 0x04, 0x40], ...seriesLoop, [0x05]] : []), // if none beyond … else
    ...driftPass,
    ...(exactFast ? [[0x0b]] : []), // end if
    ...(induced && !depositInDrift ? [
      ...holdGrid,
      [0x03, 0x40], // loop $deposit
      set(T, v128load(g(PT))),
      ...deposit(false, held),
      step(PT),
      [...i32.ltu(g(PT), g(CEND)), 0x0d, 0, 0x0b], // br_if $deposit; end
      set(PE, g(QE)),
    ] : [set(PT, g(QT)), set(PE, g(QE))]),
    [0x0c, 0, 0x0b, 0x0b], // br $chunk; end loop; end block
  ];
  const code: Code[] = [
    ...setup,
    // the induced kick's grid in locals for the whole call (3–10 % less than splatting it per pair, paired runs)
    ...(induced ? [set(VINV, P(PARAM.IND_INV)), set(VY0, P(PARAM.IND_Y0)), set(VTOP, P(PARAM.IND_TOP)), set(VKEY, P(PARAM.IND_VKEY))] : []),
    set(PT, g(DT)), set(PE, g(DE)),
    set(PEND, i32.add(g(DT), i32.shl(i32.and(g(N), i32c(-2)), i32c(3)))), // dt + 8·(n & ~1)
    ...(split ? splitLoop : twoPairs ? [...pairs2Loop, ...fusedLoop] : fusedLoop),
    // odd last particle: lane 0 only
    [...i32.and(g(N), i32c(1)), 0x04, 0x40],
    set(T, load64zero(g(PT))), set(E, load64zero(g(PE))),
    ...kickLoop, ...driftTail,
    store64lane0(g(PT), g(T)), store64lane0(g(PE), g(E)),
    counting ? set(TAIL, i32.wrapI64(i64x2lane(g(MASK), 0))) : [], // −1 inside, 0 outside
    [0x0b],
    // return n − inside
    counting
      ? i32.add(i32.sub(g(N), i32.add(i32.wrapI64(i64x2lane(g(CNT), 0)), i32.wrapI64(i64x2lane(g(CNT), 1)))), g(TAIL))
      : i32c(0),
    [0x0b],
  ];
  const fn = flat([vec([[uleb(nI32), I32], [uleb(nV128), V128]]), code]);
  return [uleb(fn.length), fn];
}

/** All kernels as [name, rf, drift]. */
export function kernelList(): [string, number, DriftKind, boolean][] {
  const list: [string, number, DriftKind, boolean][] = [];
  for (let rf = 1; rf <= 4; rf++) list.push([kernelName(rf, 'none'), rf, 'none', false]);
  for (const d of ['linear', 'exact'] as const) {
    list.push([kernelName(0, d), 0, d, false]);
    for (let rf = 1; rf <= 4; rf++) list.push([kernelName(rf, d), rf, d, false]);
    for (let rf = 1; rf <= 4; rf++) list.push([kernelName(rf, d, true), rf, d, true]);
  }
  return list;
}

/** The module bytes. shared = true imports a shared memory (maximum `maxPages`), for worker threads. */
export function buildKernelModule(options: { shared?: boolean; maxPages?: number } = {}): Uint8Array {
  const list = kernelList();
  const type = section(1, vec([[0x60, ...vec([[I32], [I32], [I32]]), ...vec([[I32]])]]));
  const limits = options.shared ? [0x03, ...uleb(1), ...uleb(options.maxPages ?? 65536)] : [0x00, ...uleb(1)];
  const imports = section(2, vec([[...str('env'), ...str('memory'), 0x02, ...limits]]));
  const funcs = section(3, vec(list.map(() => [0])));
  const exports = section(7, vec(list.map(([name], i) => [...str(name), 0x00, ...uleb(i)])));
  const code = section(10, vec(list.map(([, rf, d, ind]) => kernelBody(rf, d, ind))));
  return new Uint8Array(flat([0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00, type, imports, funcs, exports, code]));
}
