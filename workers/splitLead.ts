// Split mode, run by the first worker (the lead): it tracks its own part and drives the second worker's part
// through a MessagePort between the two workers, so the page's drawing never holds up a logging turn. Each call
// tracks whole chunks of turns in both parts at once (a chunk ends at the next logging turn), then merges:
// histograms and profiles add (profiles weighted by alive counts), diagnostics come from
// core/diagnostics/partial.ts (exact moments; 90/95 % areas from the merged action histogram, within 0.1 %).
// The page makes one call per frame; units as in workers/protocol.ts.
import { diagnosticsFromParts, mergeMoments } from '../core/diagnostics/index.ts';
import type { Setup } from '../core/setup/schema.ts';
import type { DiagRow, PartFrame, ProfileRow, RunFrame, RunRequest, TrackApi, ViewWindow } from './protocol.ts';

/** What the lead needs of a part: its own worker's functions, or the other worker's through the port. */
export type PartApi = Pick<TrackApi, 'advance' | 'moments' | 'shape'>;

export class SplitLead {
  // The last diagnostics, machine state and time per turn (for chunk sizes).
  private last: DiagRow | null = null;
  private msPerTurn = 1;
  private at = { turn: 0, time: 0, Es: 0, pc: 0 };

  /** parts[0] is the lead's own worker; `here` gives its machine state (which both parts share). */
  constructor(private readonly parts: PartApi[], private readonly setup: () => Setup, private readonly here: () => PartFrame) {}

  // The other parts' calls are posted first: the lead's own part then runs (synchronously) while they run.
  private each<T>(f: (p: PartApi) => Promise<T>): Promise<T[]> {
    const others = this.parts.slice(1).map(f);
    return Promise.all([f(this.parts[0]), ...others]);
  }

  /** The frame of the current state (fresh diagnostics), e.g. right after the parts were generated. */
  async frame(v: ViewWindow): Promise<RunFrame> {
    const pics = await this.each((p) => p.advance(0, v));
    this.last = null;
    this.note(pics[0]);
    const d = await this.diagnose(v);
    return this.merge(pics, v, 0, 0, true, [d.row], [{ turn: this.at.turn, dtMin: v.dtMin, dtMax: v.dtMax, profile: d.profile! }]);
  }

  /** Track up to req.turns turns within about req.budgetMs, never past req.until. */
  async run(req: RunRequest): Promise<RunFrame> {
    const every = this.setup().run.diagnosticsEvery;
    this.note(this.here());
    const t0 = performance.now();
    const rows: DiagRow[] = [];
    const profiles: ProfileRow[] = [];
    let done = 0;
    let track = 0;
    let pics: PartFrame[] | null = null;
    const turns = Math.max(0, Math.min(req.turns, (req.until ?? Infinity) - this.at.turn)); // a queued call may find the goal reached
    while (done < turns) {
      const toLog = every - (this.at.turn % every);
      const left = req.budgetMs - (performance.now() - t0);
      const fit = Math.max(1, Math.floor(left / this.msPerTurn));
      const n = Math.min(turns - done, toLog, fit);
      // The chunk expected to be the last one also bins the picture (saves a pass per frame).
      const last = done + n >= turns || 2 * n * this.msPerTurn >= left;
      const parts = await this.each((p) => p.advance(n, last ? req.view : null));
      pics = last ? parts : null;
      const ms = Math.max(...parts.map((p) => p.trackMs));
      this.msPerTurn = Math.max(1e-3, ms / n);
      track += ms;
      done += n;
      this.note(parts[0]);
      if (this.at.turn % every === 0) {
        const { row, profile } = await this.diagnose(req.view);
        rows.push(row);
        profiles.push({ turn: row.turn, dtMin: req.view.dtMin, dtMax: req.view.dtMax, profile: profile! });
      }
      if (last || performance.now() - t0 > req.budgetMs) break;
    }
    if (!pics) pics = await this.each((p) => p.advance(0, req.view));
    return this.merge(pics, req.view, track, done, req.fresh === true || req.turns === 0, rows, profiles);
  }

  private note(p: PartFrame): void {
    this.at = { turn: p.turn, time: p.time, Es: p.Es, pc: p.pc };
  }

  // Both passes of the split diagnostics (and the merged line density when a view is given).
  private async diagnose(v: ViewWindow | null): Promise<{ row: DiagRow; profile: Float64Array | null }> {
    const first = await this.each((p) => p.moments(v));
    const all = mergeMoments(first.map((f) => f.moments));
    const shapes = await this.each((p) => p.shape(all, this.setup().run.profileBins));
    const row = diagnosticsFromParts({ turn: this.at.turn, time: this.at.time }, all, shapes, first[0].bucket);
    const profile = v ? weighted(first.map((f) => f.profile!), first.map((f) => f.moments.n)) : null;
    this.last = row;
    return { row, profile };
  }

  // One RunFrame from the parts' pictures, with fresh diagnostics when asked (or when none are known yet).
  private async merge(parts: PartFrame[], v: ViewWindow, trackMs: number, turnsDone: number, fresh: boolean, rows: DiagRow[], profiles: ProfileRow[]): Promise<RunFrame> {
    this.note(parts[0]);
    const hist = parts[0].hist!;
    for (let k = 1; k < parts.length; k++) { const h = parts[k].hist!; for (let i = 0; i < hist.length; i++) hist[i] += h[i]; }
    const profile = weighted(parts.map((p) => p.profile!), parts.map((p) => p.alive));
    const lastRow = rows[rows.length - 1];
    let current: DiagRow;
    if (lastRow && lastRow.turn === this.at.turn) current = lastRow;
    else if (fresh || !this.last) current = (await this.diagnose(null)).row;
    else current = this.last;
    return {
      turn: this.at.turn, time: this.at.time, Es: this.at.Es, pc: this.at.pc, current, rows, profiles, view: v, hist, profile,
      points: null, events: parts[0].events, trackMs, turnsDone,
    };
  }
}

// Σ p_k·n_k / Σ n_k: line densities normalised per part, renormalised to the union.
function weighted(ps: Float64Array[], ns: number[]): Float64Array {
  const out = new Float64Array(ps[0].length);
  const N = ns.reduce((a, n) => a + n, 0);
  if (N === 0) return out;
  for (let k = 0; k < ps.length; k++) { const p = ps[k], w = ns[k] / N; for (let i = 0; i < out.length; i++) out[i] += p[i] * w; }
  return out;
}
