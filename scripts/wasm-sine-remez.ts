// Derives the coefficients of the kernels' polynomial sine (core/kernels/sine.ts): an odd degree-9 polynomial
// r·(c1 + c3 r² + c5 r⁴ + c7 r⁶ + c9 r⁸) on [−π/2, π/2], minimax in the relative error (sin r − p(r))/sin r,
// by the Remez exchange algorithm in the variable s = r² ∈ (0, (π/2)²]. Run: `npx tsx scripts/wasm-sine-remez.ts`.
// The printed coefficients are pasted into core/kernels/sine.ts (rounded to double); test/kernels.test.ts checks
// the resulting error against Math.sin on a dense grid.
const TERMS = 5; // c1, c3, c5, c7, c9
const S_MAX = (Math.PI / 2) ** 2;

// Target in s: f(s) = sin(√s)/√s, fitted by q(s) = Σ c_{2j+1} s^j with relative weight; the relative error of
// r·q(r²) against sin r equals that of q(s) against f(s).
const f = (s: number) => (s === 0 ? 1 : Math.sin(Math.sqrt(s)) / Math.sqrt(s));
const q = (c: number[], s: number) => c.reduceRight((acc, cj) => acc * s + cj, 0);
const err = (c: number[], s: number) => (q(c, s) - f(s)) / f(s);

function solve(a: number[][], b: number[]): number[] {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[piv][col])) piv = r;
    [m[col], m[piv]] = [m[piv], m[col]];
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const k = m[r][col] / m[col][col];
      for (let j = col; j <= n; j++) m[r][j] -= k * m[col][j];
    }
  }
  return m.map((row, i) => row[n] / row[i]);
}

// Chebyshev nodes as the first reference set (TERMS + 1 points).
let ref = Array.from({ length: TERMS + 1 }, (_, i) => 0.5 * S_MAX * (1 - Math.cos((Math.PI * i) / TERMS)));
let c: number[] = [];
let E = 0;
const GRID = 200_000;
for (let iter = 0; iter < 30; iter++) {
  // q(s_i) − f(s_i) = (−1)^i·E·f(s_i)
  const a = ref.map((s, i) => [...Array.from({ length: TERMS }, (_, j) => s ** j), (-1) ** i * f(s)]);
  const sol = solve(a, ref.map(f));
  c = sol.slice(0, TERMS);
  E = sol[TERMS];
  // New reference: the extremum of the error in each interval between sign changes.
  const xs: number[] = [];
  const es: number[] = [];
  for (let k = 0; k <= GRID; k++) {
    const s = (S_MAX * k) / GRID;
    xs.push(s);
    es.push(err(c, s));
  }
  const ext: number[] = [];
  let best = 0;
  for (let k = 0; k <= GRID; k++) {
    if (k > 0 && Math.sign(es[k]) !== Math.sign(es[k - 1]) && es[k] !== 0) {
      ext.push(best);
      best = k;
    } else if (Math.abs(es[k]) > Math.abs(es[best])) best = k;
  }
  ext.push(best);
  if (ext.length !== TERMS + 1) break;
  ref = ext.map((k) => xs[k]);
}
let maxErr = 0;
for (let k = 0; k <= GRID; k++) maxErr = Math.max(maxErr, Math.abs(err(c, (S_MAX * k) / GRID)));
console.log('levelled error E =', E, ' max |relative error| on the grid =', maxErr);
c.forEach((cj, j) => console.log(`c${2 * j + 1} = ${cj}`));
