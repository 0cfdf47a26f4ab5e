// The cycle view: the RF bucket along the whole cycle against the beam (planner in the analysis worker), the
// flagged intervals shaded and listed, the tracker's machine events as they happen, and the design helpers.
import { useMemo } from 'react';
import { makeParticle } from '../../core/particle.ts';
import { useApp } from '../store.ts';
import { fmtTime } from '../units.ts';
import { CyclePlot, FLAG_COLOUR } from './CyclePlot.tsx';
import { DesignHelpers } from './DesignHelpers.tsx';
import { LimitField } from './LimitField.tsx';
import { cycleTraces, limitLine } from './traces.ts';

const PLOTS: [id: string, title: string][] = [
  ['energy', 'kinetic energy [GeV]'], ['phis', 'synchronous phase φs [deg]'],
  ['voltage', 'RF voltage [kV]'], ['area', 'bucket area and beam emittance [eV·s] (log)'],
  ['filling', 'filling factor (emittance / bucket area)'], ['height', 'bucket half-height [MeV] (log)'],
  ['fs', 'synchrotron frequency fs [kHz]'], ['adiabaticity', 'adiabaticity |dωs/dt|/ωs² (log)'],
];

// Near transition the bucket grows without bound (η → 0): area, height and adiabaticity read better on log axes.
const LOG_PLOTS = new Set(['area', 'height', 'adiabaticity']);
// Quantities read against zero (a constant voltage is a flat line, not noise around one tick).
const ZERO_PLOTS = new Set(['voltage', 'filling', 'fs']);

const KIND_LABEL = { overfilled: 'bucket too small', noBucket: 'no bucket', nonAdiabatic: 'not adiabatic' } as const;

function setLimit(key: 'fillingLimit' | 'adiabaticLimit', v: number): void {
  useApp.setState((s) => ({ cycle: { ...s.cycle, [key]: v } }));
}

/** Machine events of the tracker, live (the worker sends them with every frame). */
function EventList() {
  const events = useApp((s) => s.frame?.events);
  const planned = useApp((s) => s.cycle.plan?.events);
  return (
    <div className="cycle-list">
      <h3>Machine events while tracking</h3>
      <ul id="cycle-events">
        {events?.length ? events.map((e, i) => <li key={i} className={'event-' + e.kind}>{e.message}</li>) : <li className="muted">none yet (run the tracker)</li>}
      </ul>
      {planned?.length ? (
        <>
          <h3>Expected from the planner</h3>
          <ul id="cycle-planned-events">{planned.map((e, i) => <li key={i}>{e.message}</li>)}</ul>
        </>
      ) : null}
    </div>
  );
}

/** The cycle panel; the tracker's time is marked only while it is open (`active`). */
export function CycleView(props: { active: boolean }) {
  const c = useApp((s) => s.cycle);
  const valid = useApp((s) => s.valid);
  const time = useApp((s) => (props.active && s.frame && s.frame.turn > 0 ? s.frame.time : null));
  const plan = c.plan;
  const mass = useMemo(() => makeParticle(valid.particle).mass, [valid.particle]);
  const traces = useMemo(() => {
    if (!plan) return null;
    const t = cycleTraces(plan, c.proposal, mass);
    t.filling.push(limitLine(plan, c.fillingLimit));
    t.adiabaticity.push(limitLine(plan, c.adiabaticLimit));
    return t;
  }, [plan, c.proposal, mass, c.fillingLimit, c.adiabaticLimit]);
  const vlines = useMemo(() => (plan && Number.isFinite(plan.transitionTime) ? [plan.transitionTime] : []), [plan]);
  const stale = c.planFor !== valid;
  return (
    <section className="panel cycle" aria-labelledby="cycle-title">
      <header className="panel-head">
        <h2 id="cycle-title">Cycle</h2>
        <span className="panel-note" id="cycle-state">
          {c.planError ? 'no plan' : !plan ? 'planning…' : `against cycle time [ms]: ${fmtTime(plan.time[plan.time.length - 1])} in ${plan.time.length} samples${stale || c.planBusy ? ' (updating…)' : ''}`}
        </span>
      </header>
      <div className="cycle-body">
        <div className="cycle-limits">
          <LimitField id="cycle-filling-limit" label="flag filling above" name="filling limit" value={c.fillingLimit} lo={1e-6} hi={10} onValue={(v) => setLimit('fillingLimit', v)} />
          <LimitField id="cycle-adiabatic-limit" label="flag adiabaticity above" name="adiabaticity limit" value={c.adiabaticLimit} lo={1e-9} hi={1e6} onValue={(v) => setLimit('adiabaticLimit', v)} />
          {plan ? (
            <span className="muted" id="cycle-transition" data-value={String(plan.transitionTime)}>
              {Number.isFinite(plan.transitionTime) ? `γ crosses γt at ${fmtTime(plan.transitionTime)} (dotted line)` : 'no transition crossing in this cycle'}
            </span>
          ) : null}
        </div>
        {c.planError ? <p className="warn" role="alert" id="cycle-error">{c.planError}</p> : null}
        {plan && traces ? (
          <div className="cycle-plots">
            {PLOTS.map(([id, title]) => (
              <CyclePlot key={id} id={id} title={title} data={traces[id]} intervals={plan.intervals} mark={time} logY={LOG_PLOTS.has(id)} zero={ZERO_PLOTS.has(id)} vlines={vlines} active={props.active} />
            ))}
          </div>
        ) : null}
        {plan ? (
          <div className="cycle-list">
            <h3>Flagged intervals <span className="muted">(time in s; shaded in the plots)</span></h3>
            <ul id="cycle-intervals">
              {plan.intervals.length ? plan.intervals.map((iv, i) => (
                <li key={i} className={'flag-' + iv.kind}>
                  <span className="swatch" style={{ background: FLAG_COLOUR[iv.kind] }} />
                  <b>{KIND_LABEL[iv.kind]}</b>: {iv.message}
                </li>
              )) : <li className="muted">none: the bucket holds the beam along the whole cycle within the limits</li>}
            </ul>
            <p className="muted">Beam emittance {plan.emittance.toPrecision(4)} eV·s ({plan.emittanceNote}).</p>
          </div>
        ) : null}
        <EventList />
        <DesignHelpers />
      </div>
    </section>
  );
}
