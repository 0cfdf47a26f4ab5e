// One RF gap per turn through a turn kernel (WebAssembly SIMD or TypeScript, core/kernels): the fast path of
// the tracker. Same map and conventions as rfKick.ts + drift.ts (PHYSICS.md §4): dt in s, dE in eV; kick with
// the state of turn n, drift with the state of turn n+1; |Z|·V because phases are as the particle sees them.
// Differences from the reference elements, both documented in core/kernels: the kernels' polynomial sine
// (relative error < 5.4e-9; the kick still depends on dt only, so the map stays exactly area-preserving), and
// the loss check after the pass, so a lost particle has been drifted once more before it is set aside.
import type { Bunch } from '../bunch.ts';
import { compactLost, depositLost, makeDriftParams, makeKickParams, type Columns, type InducedParams, type Limits, type TurnKernel } from '../kernels/index.ts';
import type { MachineState } from '../machine.ts';
import { storeEnergyBounds, type DriftMode, type EnergyBounds } from './drift.ts';

/** Kick and drift parameter blocks filled from machine states, reused every turn (no allocation). */
export class KernelGap {
  private readonly kick = makeKickParams();
  private readonly drift;
  private readonly limits: Limits = { dtMax: 0, dEmax: 0, dEmin: 0 };
  private readonly bounds: EnergyBounds;
  private readonly last: Float64Array; // last valid φ_k (kept when the bucket vanishes, as rfKick does)
  readonly cols: Columns;

  constructor(
    private readonly kernel: TurnKernel,
    private readonly systems: readonly number[],
    private readonly mode: DriftMode,
    aperture: number,
    cols: Columns,
  ) {
    this.drift = makeDriftParams(mode);
    this.bounds = { aperture, dEmin: 0, dEmax: 0 };
    this.last = new Float64Array(systems.length).fill(NaN);
    this.cols = cols;
  }

  /** Fill the kick block from the state of turn n. */
  setKick(m: MachineState): void {
    const k = this.kick;
    const valid = Number.isFinite(m.phiS);
    const Z = Math.abs(m.particle.Z);
    k.count = this.systems.length;
    for (let j = 0; j < k.count; j++) {
      const r = m.rf[this.systems[j]];
      if (valid) this.last[j] = r.phi;
      else if (Number.isNaN(this.last[j])) this.last[j] = (r.h / m.h) * (Math.PI / 2) + r.offset;
      k.amplitude[j] = Z * r.V;
      k.omega[j] = r.h * m.omega0;
      k.phase[j] = this.last[j];
    }
    k.dEsync = valid ? this.kernel.syncGain(k) : m.dEs; // one gap carries all of ΔE_s
  }

  /** Fill the drift block and the loss limits from the state of turn n+1. */
  setDrift(m: MachineState): void {
    const d = this.drift;
    if (this.mode === 'linear') d.slip = (m.T0 * m.eta0) / (m.beta * m.beta * m.Es);
    else {
      d.period = m.T0; d.Es = m.Es; d.beta2 = m.beta * m.beta; d.gamma2 = m.gamma * m.gamma;
      d.alpha0 = m.compaction.alpha0; d.alpha1 = m.compaction.alpha1; d.alpha2 = m.compaction.alpha2;
    }
    this.limits.dtMax = 0.5 * m.T0;
    storeEnergyBounds(this.bounds, m);
    this.limits.dEmax = this.bounds.dEmax;
    this.limits.dEmin = this.bounds.dEmin;
  }

  /** The kick alone (when other elements act between kick and drift). */
  applyKick(b: Bunch): void {
    this.kernel.kick(this.cols, b.n, this.kick);
  }

  /** The drift alone, then set the lost particles aside. */
  applyDrift(b: Bunch): void {
    if (this.kernel.drift(this.cols, b.n, this.drift, this.limits) > 0) b.n = compactLost(this.cols, b.n, this.limits);
  }

  /** Fused kick and drift in one pass, then set the lost particles aside. */
  applyKickDrift(b: Bunch): void {
    if (this.kernel.kickDrift(this.cols, b.n, this.kick, this.drift, this.limits) > 0) b.n = compactLost(this.cols, b.n, this.limits);
  }

  /** Fused kick, induced-voltage stage, drift and deposit in one pass, then set the lost particles aside. */
  applyKickDriftInduced(b: Bunch, ind: InducedParams): void {
    if (this.kernel.kickDriftInduced(this.cols, b.n, this.kick, ind, this.drift, this.limits) === 0) return;
    const before = b.n;
    b.n = compactLost(this.cols, b.n, this.limits);
    depositLost(this.cols.dt, b.n, before, ind); // lost particles take their charge with them
  }
}
