// The induced voltage of a bunch on a bin grid: binned charge → current (smoothed) → V_ind from every impedance.
// Units: dt in s, charge in C, current in A, voltage in V. PHYSICS.md §12: V_ind(dt) = −∫W(dt − dt')·I(dt')dt',
// I = Z·e·N·λ, and the kick per pass is dE += Z·V_ind(dt) (dt > 0 is the tail: wakes act on larger dt).
// Resonators go through the exact time-domain wake recursion (resonatorWake.ts: multi-turn and multi-bunch
// memory); every other model (Z/n, space charge, tables) through the FFT (spectrum.ts).
import { binCentres, type BinGrid } from './lineDensity.ts';
import type { BeamContext, Impedance, Resonator } from './impedance.ts';
import { ResonatorWakes } from './resonatorWake.ts';
import { SpectrumPath } from './spectrum.ts';

/** Induced-voltage calculator for one grid and one set of impedances; all buffers allocated once. */
export class InducedVoltage {
  readonly grid: BinGrid;
  /** Bin centres [s]. */
  readonly centres: Float64Array;
  /** Smoothed current at the bin centres [A] from the last compute. */
  readonly current: Float64Array;
  /** Induced voltage at the bin centres [V] from the last compute. */
  readonly voltage: Float64Array;
  /** FFT-path voltage on the padded grid (N samples from e0; beyond the window: the wake behind it). */
  private readonly tail: Float64Array;
  private readonly raw: Float64Array;
  private readonly spectrum: SpectrumPath;
  private readonly wakes: ResonatorWakes;
  private readonly smoothing: number;

  constructor(models: readonly Impedance[], grid: BinGrid, smoothing: number) {
    if (!(grid.nb >= 2 && grid.delta > 0)) throw new Error(`induced voltage: needs at least 2 bins of positive width, got ${grid.nb} of ${grid.delta} s`);
    this.grid = grid;
    this.centres = binCentres(grid);
    this.current = new Float64Array(grid.nb);
    this.voltage = new Float64Array(grid.nb);
    this.raw = new Float64Array(grid.nb);
    const res = models.filter((m): m is Resonator => m.kind === 'resonator');
    this.spectrum = new SpectrumPath(models.filter((m) => m.kind !== 'resonator'), grid.nb, grid.delta, smoothing);
    this.tail = new Float64Array(this.spectrum.N);
    this.wakes = new ResonatorWakes(res, grid.delta);
    this.smoothing = smoothing;
  }

  /**
   * From the charge per bin q [C]: current and V_ind at the bin centres. ctx (ω0, β, γ) scales Z/n models; Tb [s]
   * is the bunch spacing T0/M for M bunches; steady = true treats the bunch as having always circulated (no state
   * change), false advances the multi-turn memory of the resonators by one turn.
   */
  compute(q: Float64Array, ctx: BeamContext, Tb: number, M: number, steady: boolean): void {
    const nb = this.grid.nb, inv = 1 / this.grid.delta;
    const raw = this.raw, cur = this.current, v = this.voltage;
    for (let i = 0; i < nb; i++) raw[i] = q[i] * inv;
    const sp = this.spectrum;
    if (sp.active || this.smoothing > 0) sp.transform(raw);
    this.tail.fill(0);
    if (sp.active) sp.setBeam(ctx.omega0, ctx.beta, ctx.gamma);
    if (sp.active && this.smoothing > 0) sp.smoothedAndVoltage(cur, this.tail, sp.N);
    else {
      if (this.smoothing > 0) sp.smoothed(cur);
      else cur.set(raw);
      if (sp.active) sp.addVoltage(this.tail, sp.N);
    }
    for (let i = 0; i < nb; i++) v[i] = this.tail[i];
    if (this.wakes.active) this.wakes.addVoltage(cur, Tb, M, steady, v);
  }

  /** V_ind [V] at any dt from the last compute: interpolated inside the window, the wakes' continuation outside. */
  voltageAt(dt: number): number {
    const g = this.grid;
    const a = g.e0, b = g.e0 + g.nb * g.delta;
    if (dt >= a && dt < b) {
      const x = (dt - a) / g.delta - 0.5;
      if (x <= 0) return this.voltage[0];
      if (x >= g.nb - 1) return this.voltage[g.nb - 1];
      const j = Math.floor(x), f = x - j;
      return this.voltage[j] + f * (this.voltage[j + 1] - this.voltage[j]);
    }
    let v = this.wakes.active ? this.wakes.voltageOutside(dt, a, b) : 0;
    if (dt >= b) {
      // FFT part behind the window, up to the padded length (nearest sample; causal: nothing ahead of the window).
      const k = Math.floor((dt - a) / g.delta);
      if (k < this.tail.length) v += this.tail[k];
    }
    return v;
  }

  /** Forget the resonators' memory of earlier turns. */
  reset(): void {
    this.wakes.reset();
  }
}
