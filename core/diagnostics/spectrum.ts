// Spectrum of a centroid signal (e.g. mean dt turn by turn). Units: frequencies in Hz, amplitude in the unit
// of the samples. The mean is removed, a Hann window applied and the record zero-padded to a power of two.
// Amplitude = 2|X_k|/Σw (single-sided, window-gain corrected): a sine of amplitude A on a bin centre reads A.
import FFT from 'fft.js';

/** Amplitude spectrum of samples taken every sampleInterval seconds; freq[k] = k/(N·sampleInterval), k = 0..N/2. */
export function centroidSpectrum(samples: Float64Array, sampleInterval: number): { freq: Float64Array; amplitude: Float64Array } {
  const m = samples.length;
  if (m < 2) throw new Error(`centroidSpectrum needs at least 2 samples, got ${m}`);
  if (!(sampleInterval > 0)) throw new Error(`sampleInterval must be > 0, got ${sampleInterval}`);
  let N = 4;
  while (N < m) N *= 2;
  let mean = 0;
  for (let i = 0; i < m; i++) mean += samples[i];
  mean /= m;
  const data = new Array<number>(N).fill(0);
  let wSum = 0;
  for (let i = 0; i < m; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / m); // periodic Hann window over the record
    data[i] = (samples[i] - mean) * w;
    wSum += w;
  }
  const f = new FFT(N);
  const out = f.createComplexArray() as number[];
  f.realTransform(out, data);
  f.completeSpectrum(out);
  const half = N / 2;
  const freq = new Float64Array(half + 1);
  const amplitude = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    freq[k] = k / (N * sampleInterval);
    amplitude[k] = ((k === 0 || k === half ? 1 : 2) * Math.hypot(out[2 * k], out[2 * k + 1])) / wSum;
  }
  return { freq, amplitude };
}
