// Speed of the turn kernels where they run (Node, or a browser's worker): million particle-turns per second of the
// fused kick + drift over 1e6 particles, median of `runs` timed runs after a warm-up. Used by the browser
// benchmark (through the tracking worker) and by bench/kernels-wasm.ts. Units as in core/kernels/js.ts.
// The ring is fictional: 1 GeV kinetic protons, C = 300 m, γt = 6, h = 8 at 60 kV (+ h = 16 at 30 kV).
import { createKernel } from './index.ts';
import { makeDriftParams, makeKickParams, type TurnKernel } from './types.ts';

export interface KernelSpeed {
  rfSystems: number;
  drift: 'linear' | 'exact';
  impl: 'wasm' | 'js';
  particles: number;
  turns: number;
  mpts: number;
}

const MP = 938.27208816e6, ES = 1e9 + MP, GAMMA2 = (ES / MP) ** 2, BETA2 = 1 - 1 / GAMMA2;
const T0 = 300 / (Math.sqrt(BETA2) * 299792458), W0 = (2 * Math.PI) / T0, ALPHA0 = 1 / 36;

/** Mpt/s of one kernel case; the bunch is a small-amplitude Gaussian (no particle is lost). */
export function kernelSpeed(kernel: TurnKernel, rf: 1 | 2, drift: 'linear' | 'exact', particles = 1_000_000, turns = 20, runs = 5): KernelSpeed {
  const kick = makeKickParams();
  kick.count = rf;
  kick.amplitude[0] = 60e3; kick.omega[0] = 8 * W0; kick.phase[0] = 0.1;
  kick.amplitude[1] = 30e3; kick.omega[1] = 16 * W0; kick.phase[1] = Math.PI + 0.2;
  kick.dEsync = kernel.syncGain(kick);
  const d = makeDriftParams(drift);
  d.slip = (T0 * (ALPHA0 - 1 / GAMMA2)) / (BETA2 * ES);
  d.period = T0; d.Es = ES; d.beta2 = BETA2; d.gamma2 = GAMMA2; d.alpha0 = ALPHA0;
  const limits = { dtMax: T0 / 2, dEmax: 0.5 * ES };
  const cols = kernel.allocColumns(particles);
  const sigT = 0.05 / (8 * W0);
  const mpts: number[] = [];
  for (let r = 0; r <= runs; r++) {
    for (let i = 0; i < particles; i++) {
      // deterministic quasi-random Gaussian-like spread (the speed does not depend on the exact distribution)
      const u = ((i * 0.6180339887498949) % 1) + 1e-12, v = (i * 0.7548776662466927) % 1;
      const a = Math.sqrt(-2 * Math.log(u));
      cols.dt[i] = sigT * a * Math.cos(2 * Math.PI * v);
      cols.dE[i] = 1e5 * a * Math.sin(2 * Math.PI * v);
    }
    const t0 = performance.now();
    let lost = 0;
    for (let t = 0; t < turns; t++) lost += kernel.kickDrift(cols, particles, kick, d, limits);
    const s = (performance.now() - t0) / 1e3;
    if (lost !== 0) throw new Error('kernel speed: the test bunch lost particles');
    if (r > 0) mpts.push((particles * turns) / s / 1e6); // run 0 warms up (and lets the engine optimise)
  }
  kernel.freeColumns(cols);
  mpts.sort((a, b) => a - b);
  return { rfSystems: rf, drift, impl: kernel.impl, particles, turns, mpts: mpts[Math.floor(mpts.length / 2)] };
}

/** The three cases the speed goals name, with the kernel this runtime picks, in a fresh kernel (its own memory). */
export function kernelSpeeds(particles = 1_000_000): KernelSpeed[] {
  const cases: [1 | 2, 'linear' | 'exact'][] = [[1, 'linear'], [2, 'linear'], [1, 'exact']];
  return cases.map(([rf, drift]) => kernelSpeed(createKernel(undefined, { initialParticles: particles }), rf, drift, particles));
}
