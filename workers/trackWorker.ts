// Tracking worker: a thin comlink shell over the core tracker. Each call tracks for at most a time budget so
// the page can ask for a new frame every animation frame; histograms are binned here and transferred.
// Split mode (workers/pool.ts): the worker keeps one part of the beam and answers the pool's reduction calls.
import * as Comlink from 'comlink';
import { generateBeam } from '../core/beam/index.ts';
import { computeBucket } from '../core/bucket.ts';
import { bunchFrom } from '../core/bunch.ts';
import { computeDiagnostics, histogram2d, lineDensity, partialMoments, partialShape } from '../core/diagnostics/index.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import type { Setup } from '../core/setup/schema.ts';
import { kernelSpeeds } from '../core/kernels/speed.ts';
import { Tracker } from '../core/tracker.ts';
import { MAX_EVENTS, type DiagRow, type PartFrame, type ProfileRow, type RunFrame, type RunRequest, type TrackApi, type ViewWindow } from './protocol.ts';
import { SplitLead } from './splitLead.ts';

let setup: Setup | null = null;
let tracker: Tracker | null = null;
// The last diagnostics computed: stands in for the current state between logging turns (each costs ~tens of ms at 1e6).
let lastDiag: DiagRow | null = null;
// Split mode, in the first worker: drives both parts (workers/splitLead.ts).
let lead: SplitLead | null = null;
// Milliseconds the last picture took to bin (histogram, and profile when asked): run() keeps room for it.
let binMs = 0;
const NO_PROFILE = new Float64Array(0);

function need(): { s: Setup; t: Tracker } {
  if (!setup || !tracker) throw new Error('the tracker has no beam yet: call init(setup) first');
  return { s: setup, t: tracker };
}

function diagnose(t: Tracker, s: Setup): DiagRow {
  const m: MachineState = t.machine;
  const b = computeBucket(m);
  return (lastDiag = computeDiagnostics(t.bunch, m, b.ok ? b.bucket : null, s.run.profileBins));
}

function profileOf(t: Tracker, bins: number, v: ViewWindow): Float64Array {
  const out = new Float64Array(bins);
  lineDensity(t.bunch, v.dtMin, v.dtMax, out);
  return out;
}

function profileRow(t: Tracker, s: Setup, v: ViewWindow): ProfileRow {
  return { turn: t.turn, dtMin: v.dtMin, dtMax: v.dtMax, profile: profileOf(t, s.run.profileBins, v) };
}

function histOf(t: Tracker, v: ViewWindow, profile?: Float64Array): Float32Array {
  const hist = new Float32Array(v.nx * v.ny);
  histogram2d(t.bunch, v.dtMin, v.dtMax, v.dEMin, v.dEMax, v.nx, v.ny, hist, profile);
  return hist;
}

// Package the current state; every typed array goes into the transfer list.
function frameOf(rows: DiagRow[], profiles: RunFrame['profiles'], v: ViewWindow, pointsMax: number, trackMs: number, turnsDone: number, fresh: boolean): RunFrame {
  const { s, t } = need();
  const b = t.bunch;
  const t0 = performance.now();
  const profile = v.profile === false ? NO_PROFILE : new Float64Array(s.run.profileBins);
  const hist = histOf(t, v, profile.length ? profile : undefined); // picture and profile in one pass
  binMs = performance.now() - t0;
  const points = b.n <= pointsMax ? { dt: b.dt.slice(0, b.n), dE: b.dE.slice(0, b.n) } : null;
  const m = t.machine;
  // The last logged row is the current state when it was taken this turn: diagnostics cost more than a turn.
  const last = rows[rows.length - 1];
  const current = last && last.turn === t.turn ? last : fresh || !lastDiag ? diagnose(t, s) : lastDiag;
  const frame: RunFrame = {
    turn: t.turn, time: m.time, Es: m.Es, pc: m.pc, current, rows, profiles, view: v, hist, profile, points, trackMs, turnsDone,
    events: m.events.slice(-MAX_EVENTS),
  };
  const buffers: ArrayBuffer[] = [hist.buffer as ArrayBuffer, ...profiles.map((p) => p.profile.buffer as ArrayBuffer)];
  if (profile.length) buffers.push(profile.buffer as ArrayBuffer);
  if (points) buffers.push(points.dt.buffer as ArrayBuffer, points.dE.buffer as ArrayBuffer);
  return Comlink.transfer(frame, buffers);
}

function start(s: Setup, v: ViewWindow, pointsMax: number): RunFrame {
  const { bunch, matched } = generateBeam(s, machineAtStart(s));
  setup = s;
  tracker = new Tracker(s, bunch);
  lead = null;
  const first = diagnose(tracker, s);
  const f = frameOf([first], [profileRow(tracker, s, v)], v, pointsMax, 0, 0, true);
  f.matched = matched;
  return f;
}

function needLead(): SplitLead {
  if (!lead) throw new Error('split mode: this worker does not lead (call link first)');
  return lead;
}

// A merged split-mode frame to the page, its typed arrays transferred.
function transferFrame(f: RunFrame): RunFrame {
  const buffers = [f.hist, f.profile, ...f.profiles.map((p) => p.profile)].filter((a) => a.length > 0).map((a) => a.buffer as ArrayBuffer);
  return Comlink.transfer(f, [...new Set(buffers)]);
}

// A split-mode frame: the machine state, and this part's picture when a view is given.
function partFrame(v: ViewWindow | null, trackMs: number, turnsDone: number): PartFrame {
  const { s, t } = need();
  const m = t.machine;
  const profile = v ? (v.profile === false ? NO_PROFILE : new Float64Array(s.run.profileBins)) : null;
  const hist = v ? histOf(t, v, profile?.length ? profile : undefined) : null;
  const f: PartFrame = {
    turn: t.turn, time: m.time, Es: m.Es, pc: m.pc, alive: t.bunch.n, total: t.bunch.total, hist, profile, trackMs, turnsDone,
    events: m.events.slice(-MAX_EVENTS),
  };
  const buffers = [hist, profile].filter((a) => a !== null && a.length > 0).map((a) => a!.buffer as ArrayBuffer);
  return Comlink.transfer(f, buffers);
}

const api: TrackApi = {
  async init(s, v, pointsMax) {
    return start(s, v, pointsMax);
  },
  async run(req: RunRequest) {
    const { s, t } = need();
    const every = s.run.diagnosticsEvery;
    const until = req.until ?? Infinity;
    const rows: DiagRow[] = [];
    const profiles: RunFrame['profiles'] = [];
    // A call queued behind the one that reached the goal: nothing left to track, the diagnostics are current.
    if (req.turns > 0 && t.turn >= until) return frameOf(rows, profiles, req.view, req.pointsMax, 0, 0, false);
    const t0 = performance.now();
    let done = 0, trackMs = 0;
    while (done < req.turns && t.turn < until) {
      const t1 = performance.now();
      t.track(1);
      const turnMs = performance.now() - t1;
      trackMs += turnMs;
      done++;
      if (t.turn % every === 0) {
        rows.push(diagnose(t, s));
        profiles.push(profileRow(t, s, req.view));
      }
      // Stop when one more turn and the picture would end past the budget: frames then come at a steady pace.
      if (performance.now() - t0 + turnMs + binMs > req.budgetMs) break;
    }
    const fresh = req.fresh === true || req.turns === 0 || t.turn >= until;
    return frameOf(rows, profiles, req.view, req.pointsMax, trackMs, done, fresh);
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
  async initPart(s, part, v) {
    const { bunch, matched } = generateBeam(s, machineAtStart(s));
    const N = bunch.total, lo = Math.floor((N * part.index) / part.count), hi = Math.floor((N * (part.index + 1)) / part.count);
    // Generation leaves every particle alive, so a slice of [0, N) is a slice of the alive block.
    setup = s;
    tracker = new Tracker(s, bunchFrom(bunch.dt.slice(lo, hi), bunch.dE.slice(lo, hi)));
    lead = null; // the pool links the parts again
    lastDiag = null;
    const f = partFrame(v, 0, 0);
    f.matched = matched;
    return f;
  },
  async advance(turns, v) {
    const { t } = need();
    const t0 = performance.now();
    t.track(turns);
    return partFrame(v, performance.now() - t0, turns);
  },
  async moments(v) {
    const { s, t } = need();
    const b = computeBucket(t.machine);
    const moments = partialMoments(t.bunch, t.machine, b.ok ? b.bucket : null);
    const profile = v ? profileOf(t, s.run.profileBins, v) : null;
    return Comlink.transfer({ moments, profile, bucket: b.ok }, profile ? [profile.buffer as ArrayBuffer] : []);
  },
  async shape(all, bins) {
    const sh = partialShape(need().t.bunch, all, bins);
    return Comlink.transfer(sh, [sh.action.buffer as ArrayBuffer, sh.profile.buffer as ArrayBuffer]);
  },
  async link(port, isLead) {
    if (!isLead) {
      Comlink.expose(api, port);
      return;
    }
    const other = Comlink.wrap<TrackApi>(port);
    lead = new SplitLead([api, other], () => need().s, () => partFrame(null, 0, 0));
  },
  async splitFrame(v) {
    return transferFrame(await needLead().frame(v));
  },
  async splitRun(req) {
    return transferFrame(await needLead().run(req));
  },
  async adopt(s, dt, dE, alive, at) {
    const t = new Tracker(s, bunchFrom(dt, dE, alive));
    // Resume the machine where the parts were: updateSetup continues from the state's turn, time and momentum.
    const m = t.machine;
    m.turn = at.turn; m.time = at.time; m.pc = at.pc;
    t.updateSetup(s);
    setup = s;
    tracker = t;
    lead = null;
    lastDiag = null;
  },
  async memory() {
    const heap = (performance as unknown as { memory?: { usedJSHeapSize: number } }).memory;
    return { bufferBytes: tracker ? tracker.bunch.dt.buffer.byteLength : 0, heapBytes: heap ? heap.usedJSHeapSize : null };
  },
  async ping() {
    return tracker?.turn ?? -1;
  },
  async kernelSpeeds() {
    return kernelSpeeds();
  },
  async debugFail(how) {
    if (how === 'close') self.close();
    else if (how === 'throw') setTimeout(() => { throw new Error('debug: tracking worker made to fail'); });
    else { const end = Date.now() + 60_000; while (Date.now() < end); }
  },
};

Comlink.expose(api);
