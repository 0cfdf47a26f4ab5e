// The page's side of the tracking workers: one worker, or two that each track half of the beam when the dynamics
// are single-particle (no induced voltage, no radiation: those need the whole bunch or one random stream).
// It offers the one-worker TrackApi to the runner, so splitting is invisible there. In split mode the first
// worker leads: it drives the second through a port of their own (workers/splitLead.ts), and the page makes one
// call per frame, as with one worker.
// Supervision: every call must answer within a deadline, and a worker's uncaught error counts as a failure;
// either way `onFailure` is told once, and the runner replaces the pool.
import * as Comlink from 'comlink';
import type { KernelSpeed } from '../core/kernels/speed.ts';
import type { Setup } from '../core/setup/schema.ts';
import type { PartFrame, RunFrame, RunRequest, TrackApi, ViewWindow } from './protocol.ts';

/** Beams at least this large are split over two workers (below, one worker is fast enough and simpler). */
export const SPLIT_MIN = 200_000;
/** A call that tracks (bounded by its time budget) must answer within this [ms]. */
export const CALL_DEADLINE_MS = 5000;
// Beam generation is longer: allow this much more per particle [ms] (1e6 particles: 25 s in all).
const GENERATE_MS_PER_PARTICLE = 0.02;

/** True when every particle moves independently of the others (the beam may be split across workers). */
export function singleParticle(s: Setup): boolean {
  return !(s.intensity && s.impedances.length > 0) && !s.radiation;
}

interface Member {
  worker: Worker;
  api: Comlink.Remote<TrackApi>;
}

/** One or two tracking workers behind the one-worker API. */
export class TrackPool {
  private members: Member[] = [];
  private split = false;
  private setup: Setup | null = null;
  private failed = false;
  // Split mode: the machine state of the last frame (where a beam gathered into one worker resumes).
  private at = { turn: 0, time: 0, Es: 0, pc: 0 };
  // Split mode: the last tracking call queued (calls run one after the other).
  private queue: Promise<unknown> = Promise.resolve();

  constructor(private readonly make: () => Worker, private readonly maxWorkers: number, private readonly onFailure: (why: string) => void) {}

  /** Workers in use (1 or 2). */
  get workers(): number {
    return this.split ? 2 : 1;
  }

  /** Stop every worker (after a failure, or before replacing the pool). */
  terminate(): void {
    this.failed = true;
    for (const m of this.members) m.worker.terminate();
    this.members = [];
  }

  /** Benchmark hook: the turn kernel's speed alone in the first worker. */
  kernelSpeeds(): Promise<KernelSpeed[]> {
    return this.guard(this.member(0).api.kernelSpeeds(), 60_000, 'kernel benchmark');
  }

  /**
   * Benchmark hook: the current beam tracked `turns` turns by every worker in use at once (no diagnostics, no
   * picture), `repeats` times; million particle-turns per second over the page's wall time of each call, median.
   */
  async trackSpeed(turns: number, repeats: number): Promise<number> {
    const mpts: number[] = [];
    for (let r = 0; r < repeats; r++) {
      const t0 = performance.now();
      const parts = await this.each((api) => api.advance(turns, null), 60_000, 'tracking benchmark');
      const alive = parts.reduce((a, p) => a + p.alive, 0);
      mpts.push((alive * turns) / (performance.now() - t0) / 1e3);
      if (this.split) this.note(parts[0]);
    }
    return mpts.sort((a, b) => a - b)[Math.floor(repeats / 2)];
  }

  /** Test hook: make worker k fail in the given way. */
  debugFail(how: 'throw' | 'close' | 'hang', k = 0): void {
    void this.members[k]?.api.debugFail(how).catch(() => {});
  }

  private member(k: number): Member {
    while (this.members.length <= k) {
      const worker = this.make();
      worker.addEventListener('error', (e) => {
        e.preventDefault();
        this.fail(`the tracking worker stopped with an error (${e.message || 'no details'})`);
      });
      this.members.push({ worker, api: Comlink.wrap<TrackApi>(worker) });
    }
    return this.members[k];
  }

  private fail(why: string): void {
    if (this.failed) return;
    this.terminate();
    this.onFailure(why);
  }

  // Race a call against its deadline; a late answer means the worker is stuck or gone.
  private guard<T>(p: Promise<T>, ms: number, what: string): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      const timer = setTimeout(() => {
        this.fail(`the tracking worker did not answer for ${(ms / 1000).toFixed(0)} s (${what})`);
        reject(new Error(`the tracking worker did not answer (${what}); it is being restarted`));
      }, ms);
      p.then((v) => { clearTimeout(timer); resolve(v); }, (e) => { clearTimeout(timer); reject(e); });
    });
  }

  private each<T>(f: (api: Comlink.Remote<TrackApi>) => Promise<T>, ms: number, what: string): Promise<T[]> {
    const n = this.split ? 2 : 1;
    return Promise.all(Array.from({ length: n }, (_, k) => this.guard(f(this.member(k).api), ms, what)));
  }

  /** Generate the beam of a setup (split when large and single-particle) and return the frame at turn 0. */
  async init(s: Setup, v: ViewWindow, pointsMax: number): Promise<RunFrame> {
    this.setup = s;
    this.split = this.maxWorkers >= 2 && s.beam.particles >= SPLIT_MIN && singleParticle(s);
    const ms = CALL_DEADLINE_MS + GENERATE_MS_PER_PARTICLE * s.beam.particles;
    if (this.split) return this.splitInit(s, v, ms);
    // A second worker left from a split beam would keep its half: let it go.
    for (const m of this.members.splice(1)) m.worker.terminate();
    return this.guard(this.member(0).api.init(s, v, pointsMax), ms, 'generating the beam');
  }

  private async splitInit(s: Setup, v: ViewWindow, ms: number): Promise<RunFrame> {
    const parts = await Promise.all([0, 1].map((k) => this.guard(this.member(k).api.initPart(s, { index: k, count: 2 }, null), ms, 'generating the beam')));
    const { port1, port2 } = new MessageChannel();
    await this.guard(this.member(1).api.link(Comlink.transfer(port2, [port2]), false), CALL_DEADLINE_MS, 'linking the workers');
    await this.guard(this.member(0).api.link(Comlink.transfer(port1, [port1]), true), CALL_DEADLINE_MS, 'linking the workers');
    const f = await this.guard(this.member(0).api.splitFrame(v), ms, 'diagnostics'); // the pictures are binned here
    f.matched = parts[0].matched ?? null;
    this.note(f);
    return f;
  }

  /**
   * Track up to req.turns turns within about req.budgetMs (never past req.until). In split mode calls queue here, one
   * after the other, so a call the runner sends while the page handles the last frame starts at once when it ends.
   */
  run(req: RunRequest): Promise<RunFrame> {
    if (!this.split) return this.guard(this.member(0).api.run(req), CALL_DEADLINE_MS, 'tracking');
    const p = this.queue.then(() => this.guard(this.member(0).api.splitRun(req), CALL_DEADLINE_MS, 'tracking')).then((f) => {
      this.note(f);
      return f;
    });
    this.queue = p.catch(() => undefined);
    return p;
  }

  private note(p: PartFrame | RunFrame): void {
    this.at = { turn: p.turn, time: p.time, Es: p.Es, pc: p.pc };
  }

  /** New machine parameters from the next turn on; the beam is kept (gathered into one worker if it must be). */
  async updateSetup(s: Setup): Promise<void> {
    if (this.split && !singleParticle(s)) {
      const { dt, dE, alive } = await this.particles();
      const at = { turn: this.at.turn, time: this.at.time, pc: this.at.pc };
      this.members[1].worker.terminate();
      this.members.length = 1;
      this.split = false;
      await this.guard(this.member(0).api.adopt(s, Comlink.transfer(dt, [dt.buffer]), Comlink.transfer(dE, [dE.buffer]), alive, at), CALL_DEADLINE_MS, 'taking over the beam');
    } else await this.each((api) => api.updateSetup(s), CALL_DEADLINE_MS, 'updating the setup');
    this.setup = s;
  }

  /** Memory held by each worker in use. */
  memory(): Promise<{ bufferBytes: number; heapBytes: number | null }[]> {
    return this.each((api) => api.memory(), CALL_DEADLINE_MS, 'memory');
  }

  /** Check that every worker still answers (an idle page learns of a dead worker within the deadline). */
  async ping(): Promise<void> {
    await this.each((api) => api.ping(), CALL_DEADLINE_MS, 'idle check');
  }

  /** Regenerate the beam from the current setup. */
  reset(v: ViewWindow, pointsMax: number): Promise<RunFrame> {
    return this.init(this.setup!, v, pointsMax);
  }

  /** All particles (alive first: the alive of each part, then the lost), for export. */
  async particles(): Promise<{ dt: Float64Array; dE: Float64Array; alive: number }> {
    const ps = await this.each((api) => api.particles(), CALL_DEADLINE_MS, 'exporting the particles');
    if (ps.length === 1) return ps[0];
    const total = ps.reduce((a, p) => a + p.dt.length, 0);
    const dt = new Float64Array(total), dE = new Float64Array(total);
    let o = 0;
    for (const p of ps) { dt.set(p.dt.subarray(0, p.alive), o); dE.set(p.dE.subarray(0, p.alive), o); o += p.alive; }
    for (const p of ps) { dt.set(p.dt.subarray(p.alive), o); dE.set(p.dE.subarray(p.alive), o); o += p.dt.length - p.alive; }
    return { dt, dE, alive: ps.reduce((a, p) => a + p.alive, 0) };
  }
}
