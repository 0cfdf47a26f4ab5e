// Induced voltage in the frequency domain, Ṽ = −Z(ω)·Ĩ (PHYSICS.md §12), by FFT of the binned current.
// Units: current in A, voltage in V, ω in rad/s. Convention e^{+jωt}: with fft.js's forward transform
// X_k = Σ x_n e^{−2πikn/N} and ω_k = 2πk/(NΔ), the samples of V = −W∗I are V = −IFFT(Z_k·X_k) (the Δ of the
// Fourier integral cancels the 1/(NΔ) of its inverse). Frequencies above N/2 are negative: Z(−ω) = Z(ω)*;
// at the Nyquist bin only Re Z is kept so V stays real.
// The window of nb bins is zero-padded to N = the power of two ≥ 2·nb: a wake shorter than the padding does not
// wrap onto the bunch. Use it for short-range models (broad-band, Z/n, tables); long-lived resonators belong to
// resonatorWake.ts (their wake outlives the padding).
// Smoothing: the line density is filtered by a Gaussian of rms width σ = smoothing·Δ, G(ω) = exp(−(ωσ)²/2).
import FFT from 'fft.js';
import { impedanceAt, type BeamContext, type Impedance } from './impedance.ts';

/** FFT convolution of bin currents with −Z, plus the Gaussian smoothing of the current; buffers allocated once. */
export class SpectrumPath {
  readonly N: number;
  private readonly fft: FFT;
  private readonly data: Float64Array;
  private readonly spec: Float64Array;
  private readonly work: Float64Array;
  private readonly out: Float64Array;
  /** −Z(ω_k)·G(ω_k), interleaved re/im, for the current ω0. */
  private readonly kernel: Float64Array;
  private readonly filter: Float64Array;
  private readonly ctx: BeamContext = { omega0: NaN, beta: NaN, gamma: NaN };
  private readonly z = new Float64Array(2);

  constructor(private readonly models: readonly Impedance[], readonly nb: number, readonly delta: number, smoothing: number) {
    let N = 4;
    while (N < 2 * nb) N *= 2;
    this.N = N;
    this.fft = new FFT(N);
    this.data = new Float64Array(N); // real input, zero-padded
    this.spec = new Float64Array(2 * N);
    this.work = new Float64Array(2 * N);
    this.out = new Float64Array(2 * N);
    this.kernel = new Float64Array(2 * N);
    this.filter = new Float64Array(N);
    const sigma = smoothing * delta;
    for (let k = 0; k < N; k++) {
      const w = this.omegaOf(k);
      this.filter[k] = Math.exp(-0.5 * w * w * sigma * sigma);
    }
  }

  /** True if any model goes through the FFT. */
  get active(): boolean {
    return this.models.length > 0;
  }

  /** Angular frequency of FFT bin k [rad/s] (negative above N/2). */
  omegaOf(k: number): number {
    const kk = k <= this.N / 2 ? k : k - this.N;
    return (2 * Math.PI * kk) / (this.N * this.delta);
  }

  /** Recompute −Z·G for a beam state (ω0 [rad/s], β, γ: Z/n and space charge follow them), if it changed. */
  setBeam(omega0: number, beta: number, gamma: number): void {
    const c = this.ctx;
    if (omega0 === c.omega0 && beta === c.beta && gamma === c.gamma) return;
    c.omega0 = omega0; c.beta = beta; c.gamma = gamma;
    const z = this.z;
    const N = this.N, kern = this.kernel;
    for (let k = 0; k <= N / 2; k++) {
      const w = this.omegaOf(k);
      let re = 0, im = 0;
      for (const m of this.models) {
        impedanceAt(m, w, c, z);
        re += z[0];
        im += z[1];
      }
      if (k === N / 2 || k === 0) im = 0;
      const g = this.filter[k];
      kern[2 * k] = -re * g;
      kern[2 * k + 1] = -im * g;
      if (k > 0 && k < N / 2) {
        kern[2 * (N - k)] = -re * g;
        kern[2 * (N - k) + 1] = im * g;
      }
    }
  }

  /** FFT of the current I[0..nb) (zero-padded, a real transform); keeps the spectrum for the calls below. */
  transform(I: Float64Array): void {
    const d = this.data;
    d.fill(0);
    d.set(I.subarray(0, this.nb));
    this.fft.realTransform(this.spec, d);
    this.fft.completeSpectrum(this.spec);
  }

  /**
   * smoothed(cur) and addVoltage(v, len) in one inverse FFT: both spectra are Hermitian (their signals are real),
   * so the inverse of G·Ĩ + i·(−Z·G·Ĩ) has the smoothed current as its real part and the voltage as its imaginary.
   */
  smoothedAndVoltage(cur: Float64Array, v: Float64Array, len = this.nb): void {
    const s = this.spec, w = this.work, kn = this.kernel, g = this.filter;
    for (let k = 0; k < this.N; k++) {
      const a = s[2 * k], b = s[2 * k + 1], c = kn[2 * k], e = kn[2 * k + 1];
      w[2 * k] = a * g[k] - (a * e + b * c); // Re(G·Ĩ) − Im(K·Ĩ)
      w[2 * k + 1] = b * g[k] + (a * c - b * e); // Im(G·Ĩ) + Re(K·Ĩ)
    }
    this.fft.inverseTransform(this.out, w);
    for (let i = 0; i < this.nb; i++) cur[i] = this.out[2 * i];
    for (let i = 0; i < len; i++) v[i] += this.out[2 * i + 1];
  }

  /** The smoothed current (inverse FFT of G·Ĩ) into out[0..nb). */
  smoothed(out: Float64Array): void {
    const s = this.spec, w = this.work, g = this.filter;
    for (let k = 0; k < this.N; k++) {
      w[2 * k] = s[2 * k] * g[k];
      w[2 * k + 1] = s[2 * k + 1] * g[k];
    }
    this.fft.inverseTransform(this.out, w);
    for (let i = 0; i < this.nb; i++) out[i] = this.out[2 * i];
  }

  /** Voltage −IFFT(Z·G·Ĩ) added to v[0..len) (len ≤ N: samples beyond nb are the wake behind the window). */
  addVoltage(v: Float64Array, len = this.nb): void {
    const s = this.spec, w = this.work, kn = this.kernel;
    for (let k = 0; k < this.N; k++) {
      const a = s[2 * k], b = s[2 * k + 1], c = kn[2 * k], e = kn[2 * k + 1];
      w[2 * k] = a * c - b * e;
      w[2 * k + 1] = a * e + b * c;
    }
    this.fft.inverseTransform(this.out, w);
    for (let i = 0; i < len; i++) v[i] += this.out[2 * i];
  }
}
