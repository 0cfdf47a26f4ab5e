// The intensity view at turn 0: RF and induced voltage over the bunch, the potential well with and without the
// beam's own field, the separatrix with that field over the RF-only one, and the energy lost to the impedance.
import { useMemo } from 'react';
import type { Data } from 'plotly.js';
import { bucketAt } from '../derived.ts';
import { useApp } from '../store.ts';
import { fmt, fmtEnergy, fmtTime } from '../units.ts';
import type { IntensityReport } from './report.ts';
import { SmallPlot } from './SmallPlot.tsx';

const INK = '#1f3b5c', RUST = '#c0561b', GREEN = '#2f6b3a', GREY = '#8a9099';

function line(x: ArrayLike<number>, y: ArrayLike<number>, name: string, colour: string, extra: Record<string, unknown> = {}): Data {
  return { type: 'scatter', mode: 'lines', x: Array.from(x), y: Array.from(y), name, line: { color: colour, width: 1.4 }, ...extra } as Data;
}

function traces(r: IntensityReport, rfSep: { dt: Float64Array; dE: Float64Array } | null) {
  const ns = (a: Float64Array) => Array.from(a, (t) => t * 1e9);
  const x = ns(r.dt);
  const kv = (a: Float64Array) => Array.from(a, (v) => v * 1e-3);
  const voltages = [
    line(x, kv(r.rf), 'RF', INK), line(x, kv(r.induced), 'induced', RUST), line(x, Array.from(r.rf, (v, i) => (v + r.induced[i]) * 1e-3), 'RF + induced', GREEN, { line: { color: GREEN, width: 1.2, dash: 'dash' } }),
    line(x, Array.from(r.lambda, (l) => l * 1e-9), 'line density', GREY, { yaxis: 'y2', fill: 'tozeroy', fillcolor: 'rgba(138,144,153,0.15)', line: { color: GREY, width: 1 } }),
  ];
  const wx = ns(r.well.dt);
  const well = [line(wx, r.well.Urf, 'RF alone', INK), line(wx, r.well.U, 'with the beam', RUST)];
  const sep: Data[] = [];
  if (rfSep) sep.push(line(ns(rfSep.dt), Array.from(rfSep.dE, (e) => e * 1e-6), 'RF alone', INK));
  if (r.separatrix) sep.push(line(ns(r.separatrix.dt), Array.from(r.separatrix.dE, (e) => e * 1e-6), 'with the beam', RUST));
  return { voltages, well, sep };
}

function Numbers(props: { r: IntensityReport }) {
  const r = props.r;
  const rows: [string, string, number, string][] = [
    ['int-n', 'particles per bunch', r.particlesPerBunch, fmt(r.particlesPerBunch)],
    ['int-loss-factor', 'loss factor k', r.lossFactor, `${fmt(r.lossFactor * 1e-12)} V/pC`],
    ['int-loss-particle', 'energy loss per turn, per particle', r.lossPerParticle, fmtEnergy(r.lossPerParticle)],
    ['int-loss-bunch', 'energy loss per turn, per bunch', r.lossPerBunch, `${fmt(r.lossPerBunch * 1e6)} µJ`],
    ['int-peak', 'peak induced voltage', r.peakInduced, `${fmt(r.peakInduced * 1e-3)} kV`],
    ['int-length', 'rms length with / without intensity', r.rmsLength, `${fmtTime(r.rmsLength)} / ${fmtTime(r.zeroIntensityRmsLength)}`],
    ['int-shift', 'well bottom shift', r.phaseShiftDeg, `${fmt(r.phaseShiftDeg)}° (${fmtTime(r.bottom)})`],
  ];
  return (
    <dl className="int-numbers">
      {rows.map(([id, label, v, text]) => (
        <div key={id}>
          <dt>{label}</dt>
          <dd id={id} data-value={String(v)}>{text}</dd>
        </div>
      ))}
    </dl>
  );
}

/** The intensity panel; its plots draw only while it is open (`active`). */
export function IntensityView(props: { active: boolean }) {
  const st = useApp((s) => s.intensity);
  const valid = useApp((s) => s.valid);
  const rfSep = bucketAt(valid, null).sep;
  const r = st.reportFor === valid || st.busy ? st.report : null;
  const t = useMemo(() => (r ? traces(r, rfSep) : null), [r, rfSep]);
  return (
    <section className="panel intensity" aria-labelledby="intensity-title">
      <header className="panel-head">
        <h2 id="intensity-title">Intensity at turn 0</h2>
        <span className="panel-note" id="intensity-state">
          {st.busy ? 'solving the matched bunch with its own field…' : r ? `self-consistent bunch: ${r.converged ? 'converged' : 'not converged'} in ${r.iterations} iterations` : (st.error ?? '')}
        </span>
      </header>
      {r && t ? (
        <div className="int-body">
          <Numbers r={r} />
          <SmallPlot active={props.active} id="voltage" title="RF and induced voltage over the bunch" data={t.voltages} yTitle="voltage [kV]" y2="λ [1/ns]" />
          <SmallPlot active={props.active} id="well" title="potential well (per turn, 0 at the bottom; the beam's field inside its window and behind it)" data={t.well} yTitle="U" />
          <SmallPlot active={props.active} id="separatrix" title="separatrix with the beam's own field" data={t.sep} yTitle="dE [MeV]" />
        </div>
      ) : (
        <p className="muted int-empty" id="intensity-empty">
          {st.busy ? '' : st.error ?? 'Add an intensity and an impedance in the editor (Intensity and radiation) to see the induced voltage.'}
        </p>
      )}
    </section>
  );
}
