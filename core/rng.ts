// Seeded pseudo-random numbers, so that the same seed gives the same beam everywhere (Node, worker, page).
// Generator: xoshiro128** 1.1 (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number generators",
// ACM TOMS 47 (2021)); state seeded from one 32-bit seed with splitmix32 (common practice).
// Normal deviates: Marsaglia polar method (G. Marsaglia and T.A. Bray, SIAM Review 6 (1964) 260).

export interface Rng {
  /** Uniform in [0, 1), 53-bit resolution. */
  uniform(): number;
  /** Standard normal N(0, 1). */
  normal(): number;
}

/** A seeded xoshiro128** generator. */
export function makeRng(seed: number): Rng {
  let x = seed >>> 0;
  const next32 = (): number => {
    // splitmix32, for seeding only
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  };
  let s0 = next32(), s1 = next32(), s2 = next32(), s3 = next32();
  const u32 = (): number => {
    const r = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = s1 << 9;
    s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3; s2 ^= t; s3 = rotl(s3, 11);
    return r;
  };
  let spare = NaN;
  const uniform = (): number => ((u32() >>> 5) * 67108864 + (u32() >>> 6)) / 9007199254740992;
  const normal = (): number => {
    if (!Number.isNaN(spare)) {
      const v = spare;
      spare = NaN;
      return v;
    }
    let a: number, b: number, r: number;
    do {
      a = 2 * uniform() - 1;
      b = 2 * uniform() - 1;
      r = a * a + b * b;
    } while (r >= 1 || r === 0);
    const f = Math.sqrt((-2 * Math.log(r)) / r);
    spare = b * f;
    return a * f;
  };
  return { uniform, normal };
}

function rotl(v: number, k: number): number {
  return (v << k) | (v >>> (32 - k));
}
