// Tracking worker: a thin comlink shell over the core tracker. Each call tracks for at most a time budget so
// the page can ask for a new frame every animation frame; histograms are binned here and transferred.
import * as Comlink from 'comlink';
import { generateBeam } from '../core/beam/index.ts';
import { computeBucket } from '../core/bucket.ts';
import { computeDiagnostics, histogram2d, lineDensity } from '../core/diagnostics/index.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import type { Setup } from '../core/setup/schema.ts';
import { Tracker } from '../core/tracker.ts';
import { MAX_EVENTS, type DiagRow, type ProfileRow, type RunFrame, type RunRequest, type TrackApi, type ViewWindow } from './protocol.ts';

let setup: Setup | null = null;
let tracker: Tracker | null = null;

function need(): { s: Setup; t: Tracker } {
  if (!setup || !tracker) throw new Error('the tracker has no beam yet: call init(setup) first');
  return { s: setup, t: tracker };
}

function diagnose(t: Tracker, s: Setup): DiagRow {
  const m: MachineState = t.machine;
  const b = computeBucket(m);
  return computeDiagnostics(t.bunch, m, b.ok ? b.bucket : null, s.run.profileBins);
}

function profileOf(t: Tracker, s: Setup, v: ViewWindow): Float64Array {
  const out = new Float64Array(s.run.profileBins);
  lineDensity(t.bunch, v.dtMin, v.dtMax, out);
  return out;
}

function profileRow(t: Tracker, s: Setup, v: ViewWindow): ProfileRow {
  return { turn: t.turn, dtMin: v.dtMin, dtMax: v.dtMax, profile: profileOf(t, s, v) };
}

// Package the current state; every typed array goes into the transfer list.
function frameOf(rows: DiagRow[], profiles: RunFrame['profiles'], v: ViewWindow, pointsMax: number, trackMs: number, turnsDone: number): RunFrame {
  const { s, t } = need();
  const b = t.bunch;
  const hist = new Float32Array(v.nx * v.ny);
  histogram2d(b, v.dtMin, v.dtMax, v.dEMin, v.dEMax, v.nx, v.ny, hist);
  const profile = profileOf(t, s, v);
  const points = b.n <= pointsMax ? { dt: b.dt.slice(0, b.n), dE: b.dE.slice(0, b.n) } : null;
  const m = t.machine;
  // The last logged row is the current state when it was taken this turn: diagnostics cost more than a turn.
  const last = rows[rows.length - 1];
  const current = last && last.turn === t.turn ? last : diagnose(t, s);
  const frame: RunFrame = {
    turn: t.turn, time: m.time, Es: m.Es, pc: m.pc, current, rows, profiles, view: v, hist, profile, points, trackMs, turnsDone,
    events: m.events.slice(-MAX_EVENTS),
  };
  const buffers: ArrayBuffer[] = [hist.buffer as ArrayBuffer, profile.buffer as ArrayBuffer, ...profiles.map((p) => p.profile.buffer as ArrayBuffer)];
  if (points) buffers.push(points.dt.buffer as ArrayBuffer, points.dE.buffer as ArrayBuffer);
  return Comlink.transfer(frame, buffers);
}

function start(s: Setup, v: ViewWindow, pointsMax: number): RunFrame {
  const { bunch, matched } = generateBeam(s, machineAtStart(s));
  setup = s;
  tracker = new Tracker(s, bunch);
  const first = diagnose(tracker, s);
  const f = frameOf([first], [profileRow(tracker, s, v)], v, pointsMax, 0, 0);
  f.matched = matched;
  return f;
}

const api: TrackApi = {
  async init(s, v, pointsMax) {
    return start(s, v, pointsMax);
  },
  async run(req: RunRequest) {
    const { s, t } = need();
    const every = s.run.diagnosticsEvery;
    const rows: DiagRow[] = [];
    const profiles: RunFrame['profiles'] = [];
    const t0 = performance.now();
    let done = 0;
    while (done < req.turns) {
      t.track(1);
      done++;
      if (t.turn % every === 0) {
        rows.push(diagnose(t, s));
        profiles.push(profileRow(t, s, req.view));
      }
      if (performance.now() - t0 > req.budgetMs) break;
    }
    return frameOf(rows, profiles, req.view, req.pointsMax, performance.now() - t0, done);
  },
  async updateSetup(s) {
    need().t.updateSetup(s);
    setup = s;
  },
  async reset(v, pointsMax) {
    return start(need().s, v, pointsMax);
  },
  async particles() {
    const b = need().t.bunch;
    const dt = b.dt.slice(0, b.total);
    const dE = b.dE.slice(0, b.total);
    return Comlink.transfer({ dt, dE, alive: b.n }, [dt.buffer, dE.buffer]);
  },
};

Comlink.expose(api);
