// The `track` command: generate the setup's beam, track it, and write per-turn diagnostics as CSV
// (header carries units), optionally the final particles.
import { generateBeam } from '../core/beam/index.ts';
import { computeBucket } from '../core/bucket.ts';
import { computeDiagnostics, DiagnosticsLog } from '../core/diagnostics/index.ts';
import { machineAtStart } from '../core/machine.ts';
import type { Setup } from '../core/setup/schema.ts';
import { Tracker } from '../core/tracker.ts';

export interface TrackRequest {
  turns: number;
  every: number;
}

/** Track and return the diagnostics log and the tracker (for the final particles). */
export function trackSetup(setup: Setup, req: TrackRequest): { log: DiagnosticsLog; tracker: Tracker } {
  const m0 = machineAtStart(setup);
  const { bunch } = generateBeam(setup, m0);
  const tracker = new Tracker(setup, bunch);
  const log = new DiagnosticsLog();
  const bins = setup.run.profileBins;
  const record = (t: Tracker) => {
    const br = computeBucket(t.machine);
    log.push(computeDiagnostics(t.bunch, t.machine, br.ok ? br.bucket : null, bins));
  };
  record(tracker);
  tracker.track(req.turns, (t) => {
    if (t.turn % req.every === 0 || t.turn === req.turns) record(t);
  });
  return { log, tracker };
}

/** Final particles as CSV: alive flag, dt [s], dE [eV]. */
export function particlesCsv(t: Tracker): string {
  const b = t.bunch;
  const rows = ['alive,dt_s,dE_eV'];
  for (let i = 0; i < b.total; i++) rows.push(`${i < b.n ? 1 : 0},${b.dt[i]},${b.dE[i]}`);
  return rows.join('\n') + '\n';
}
