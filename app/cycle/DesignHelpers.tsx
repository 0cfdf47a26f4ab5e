// Design helpers: the voltage program that keeps the bucket area (or the filling factor) constant, and the
// fastest momentum ramp at a target filling factor. Each is computed in the analysis worker, drawn dashed over
// the current program in the plots above, and applied with one action (setup, editor and link follow).
import { useState } from 'react';
import { makeParticle } from '../../core/particle.ts';
import { useApp } from '../store.ts';
import { applyProposal, discardProposal, proposeConstantBucket, proposeFastestRamp } from './analysis.ts';
import { LimitField } from './LimitField.tsx';

/** The design-helper block of the cycle view. */
export function DesignHelpers() {
  const c = useApp((s) => s.cycle);
  const valid = useApp((s) => s.valid);
  const plan = c.plan;
  const [by, setBy] = useState<'area' | 'filling'>('area');
  const [area, setArea] = useState<number | null>(null);
  const [filling, setFilling] = useState(0.6);
  const [rampFilling, setRampFilling] = useState(0.7);
  const [target, setTarget] = useState<number | null>(null);
  if (!plan) return null;
  const mass = makeParticle(valid.particle).mass;
  const area0 = Number(plan.bucketArea[0].toPrecision(4));
  const tEnd = Number(((plan.energy[plan.energy.length - 1] - mass) * 1e-9).toPrecision(4));
  const gev = target ?? tEnd;
  const busy = c.designBusy !== null;
  return (
    <div className="cycle-list design">
      <h3>Design helpers</h3>
      <div className="design-row">
        <b>Voltage program for a constant bucket</b>
        <label><input type="radio" name="design-by" checked={by === 'area'} onChange={() => setBy('area')} /> hold the area</label>
        <label><input type="radio" name="design-by" id="design-by-filling" checked={by === 'filling'} onChange={() => setBy('filling')} /> hold the filling factor</label>
        {by === 'area' ? (
          <LimitField key={'a' + area0} id="design-area" label="at" name="bucket area" value={area ?? area0} lo={1e-12} hi={1000} unit="eV·s" onValue={setArea} />
        ) : (
          <LimitField id="design-filling" label="at" name="filling factor" value={filling} lo={0.01} hi={1} onValue={setFilling} />
        )}
        <button type="button" id="design-constant" disabled={busy} onClick={() => proposeConstantBucket(by === 'area' ? { area: area ?? area0 } : { filling })}>
          Propose
        </button>
      </div>
      <div className="design-row">
        <b>Fastest ramp at a filling factor</b>
        <LimitField key={'e' + tEnd} id="design-ramp-end" label="to kinetic energy" name="final kinetic energy" value={gev} lo={1e-6} hi={1e5} unit="GeV" onValue={setTarget} />
        <LimitField id="design-ramp-filling" label="filling" name="filling factor" value={rampFilling} lo={0.01} hi={1} onValue={setRampFilling} />
        <button type="button" id="design-ramp" disabled={busy} onClick={() => { const T = gev * 1e9; proposeFastestRamp(Math.sqrt(T * (T + 2 * mass)), rampFilling); }}>
          Propose
        </button>
      </div>
      {busy ? <p className="muted" id="design-busy">computing the {c.designBusy}…</p> : null}
      {c.designError ? <p className="warn" role="alert" id="design-error">{c.designError}</p> : null}
      {c.proposal ? (
        <div className="proposal" id="design-proposal">
          <span>
            Proposed ({c.proposal.title}; dashed in the plots):{' '}
            {c.proposal.kind === 'voltage' ? `voltage tables of ${c.proposal.programs[0].points.length} points` : `momentum table of ${c.proposal.program.points.length} points, ending at ${(c.proposal.program.points.at(-1)![0] * 1e3).toPrecision(4)} ms`}
          </span>
          <button type="button" className="primary" id="design-apply" onClick={applyProposal}>Apply to the setup</button>
          <button type="button" onClick={discardProposal}>Discard</button>
        </div>
      ) : null}
    </div>
  );
}
