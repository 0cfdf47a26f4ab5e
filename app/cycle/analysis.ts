// Drives the analysis worker from the store: re-plans the cycle and re-solves the intensity report when the
// running setup (or a planner limit) changes, one request of each kind in flight, the latest input wins. The
// design helpers' proposals are applied to the draft through core/program's apply functions, so they land in
// the setup, the editor and the link like any edit.
import * as Comlink from 'comlink';
import { withMomentumProgram, withRfProgram } from '../../core/program/index.ts';
import type { SetupInput } from '../../core/setup/schema.ts';
import { setDraft, useApp } from '../store.ts';
import type { AnalysisApi } from './analysisWorker.ts';
import type { CycleState } from './types.ts';

// Wait this long after the last edit before asking the worker (typing a number edits on every key).
const SETTLE_MS = 200;

let api: Comlink.Remote<AnalysisApi> | null = null;

function setCycle(patch: Partial<CycleState>): void {
  useApp.setState((s) => ({ cycle: { ...s.cycle, ...patch } }));
}

// One job kind: at most one call in flight; when it returns and the input moved on, it runs again.
function coalesced(key: () => unknown, run: () => Promise<void>): () => void {
  let busy = false, timer = 0, last: unknown = undefined;
  const go = async () => {
    if (busy) return;
    const k = key();
    if (k === last) return;
    busy = true;
    last = k;
    try { await run(); } finally { busy = false; }
    go();
  };
  return () => { clearTimeout(timer); timer = window.setTimeout(go, SETTLE_MS); };
}

const planKey = () => { const s = useApp.getState(); return `${s.cycle.fillingLimit}|${s.cycle.adiabaticLimit}|${id(s.valid)}`; };
const ids = new WeakMap<object, number>();
let nextId = 0;
function id(o: object): number {
  if (!ids.has(o)) ids.set(o, ++nextId);
  return ids.get(o)!;
}

const replan = coalesced(planKey, async () => {
  const s = useApp.getState(), setup = s.valid;
  setCycle({ planBusy: true });
  const r = await api!.plan(setup, s.cycle.fillingLimit, s.cycle.adiabaticLimit);
  setCycle(r.ok ? { plan: r.value, planFor: setup, planError: null, planBusy: false } : { plan: null, planFor: setup, planError: r.message, planBusy: false });
});

const reIntensity = coalesced(() => id(useApp.getState().valid), async () => {
  const setup = useApp.getState().valid;
  if (!setup.intensity || setup.impedances.length === 0) {
    useApp.setState({ intensity: { report: null, reportFor: setup, error: null, busy: false } });
    return;
  }
  useApp.setState((s) => ({ intensity: { ...s.intensity, busy: true } }));
  const r = await api!.intensity(setup);
  useApp.setState({
    intensity: r.ok
      ? { report: r.value.report, reportFor: setup, error: r.value.reason, busy: false }
      : { report: null, reportFor: setup, error: r.message, busy: false },
  });
});

/** Start the worker and follow the store (once). */
export function startAnalysis(): void {
  if (api) return;
  const worker = new Worker(new URL('./analysisWorker.ts', import.meta.url), { type: 'module' });
  api = Comlink.wrap<AnalysisApi>(worker);
  useApp.subscribe((s, prev) => {
    if (s.valid !== prev.valid || s.cycle.fillingLimit !== prev.cycle.fillingLimit || s.cycle.adiabaticLimit !== prev.cycle.adiabaticLimit) replan();
    if (s.valid !== prev.valid) reIntensity();
  });
  replan();
  reIntensity();
}

/** Ask for the voltage program that keeps the bucket area (or the filling factor) constant. */
export async function proposeConstantBucket(target: { area: number } | { filling: number }): Promise<void> {
  if (!api) return;
  setCycle({ designBusy: 'voltage program for a constant bucket', designError: null, proposal: null });
  const r = await api.constantBucket(useApp.getState().valid, target);
  setCycle(r.ok ? { proposal: r.value, designBusy: null } : { designError: r.message, designBusy: null });
}

/** Ask for the fastest momentum ramp to p·c = pcEnd [eV] at a filling factor. */
export async function proposeFastestRamp(pcEnd: number, filling: number): Promise<void> {
  if (!api) return;
  setCycle({ designBusy: 'fastest momentum ramp', designError: null, proposal: null });
  const r = await api.fastestRamp(useApp.getState().valid, pcEnd, filling);
  setCycle(r.ok ? { proposal: r.value, designBusy: null } : { designError: r.message, designBusy: null });
}

/** Put the proposal into the draft (one edit: setup, editor and link follow); errors stay next to the helper. */
export function applyProposal(): void {
  const p = useApp.getState().cycle.proposal;
  if (!p) return;
  try {
    let doc = useApp.getState().draft as SetupInput;
    if (p.kind === 'voltage') p.programs.forEach((prog, k) => { doc = withRfProgram(doc, k, 'voltage', prog); });
    else doc = withMomentumProgram(doc, p.program);
    setDraft(doc);
    setCycle({ proposal: null, designError: null });
  } catch (e) {
    setCycle({ designError: String((e as Error).message ?? e) });
  }
}

/** Drop the proposal. */
export function discardProposal(): void {
  setCycle({ proposal: null });
}
