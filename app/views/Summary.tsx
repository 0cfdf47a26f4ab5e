// Numbers of the bucket at the shown energy and of the beam now. Each value carries its full-precision number
// in data-value, so it can be compared exactly (the browser tests read it).
import { bucketAt } from '../derived.ts';
import { shownPoint } from '../runner.ts';
import { useApp } from '../store.ts';
import { fmt, fmtEnergy, fmtFreq, fmtTime } from '../units.ts';
import { CollectiveNumbers } from '../intensity/CollectiveNumbers.tsx';

const RAD2DEG = 180 / Math.PI;

function Item(props: { id: string; label: string; value: number; text?: string; title?: string }) {
  return (
    <>
      <dt title={props.title}>{props.label}</dt>
      <dd id={'sum-' + props.id} data-value={String(props.value)}>
        {props.text ?? fmt(props.value)}
      </dd>
    </>
  );
}

/** The bucket and beam summary panel. */
export function Summary() {
  const valid = useApp((s) => s.valid);
  const at = useApp((s) => shownPoint(s));
  const cur = useApp((s) => s.frame?.current ?? null);
  const v = bucketAt(valid, at);
  const mb = useApp((s) => s.matched);
  const m = v.m;
  const b = v.bucket;
  return (
    <section className="panel summary" aria-labelledby="summary-title">
      <header className="panel-head">
        <h2 id="summary-title">Bucket and beam</h2>
        <span className="panel-note">{at === null ? 'at turn 0' : `at the current turn, E = ${fmtEnergy(m.Es)}`}</span>
      </header>
      <div className="summary-cols">
        <dl>
          <Item id="phis" label="synchronous phase φs" value={m.phiS * RAD2DEG} text={Number.isFinite(m.phiS) ? `${fmt(m.phiS * RAD2DEG)}°` : 'none'} />
          <Item id="qs" label="synchrotron tune Qs" value={v.Qs} />
          <Item id="fs" label="synchrotron frequency fs" value={v.fs} text={fmtFreq(v.fs)} />
          <Item id="area" label="bucket area" value={b?.area ?? NaN} text={b ? `${fmt(b.area)} eV·s` : '—'} />
          <Item id="height" label="bucket half-height" value={b?.halfHeightDE ?? NaN} text={b ? `${fmtEnergy(b.halfHeightDE)} (δ ${fmt(b.halfHeightDelta)})` : '—'} />
          <Item id="length" label="bucket length" value={b?.length ?? NaN} text={b ? fmtTime(b.length) : '—'} />
          <Item id="matched-length" label="matched rms length" value={mb?.rmsLength ?? NaN} text={mb ? fmtTime(mb.rmsLength) : '—'} title="of the requested matched bunch at turn 0" />
          <Item id="filling" label="filling factor" value={mb?.fillingFactor ?? NaN} text={mb ? `${fmt(mb.fillingFactor * 100)} %` : '—'} title="limiting-contour area / bucket area, turn 0" />
        </dl>
        <dl>
          <Item id="eta" label="slip factor η" value={m.eta0} />
          <Item id="gamma" label="γ" value={m.gamma} />
          <Item id="f0" label="revolution frequency" value={m.f0} text={fmtFreq(m.f0)} />
          <Item id="kinetic" label="kinetic energy" value={m.T} text={m.particle.A > 1 ? `${fmtEnergy(m.T)} (${fmtEnergy(m.T / m.particle.A)}/u)` : fmtEnergy(m.T)} title="per nucleon: divided by the mass number A" />
          <Item id="rms-length" label="beam rms length σt" value={cur?.rmsDt ?? NaN} text={cur ? fmtTime(cur.rmsDt) : '—'} />
          <Item id="rms-spread" label="beam rms spread σE" value={cur?.rmsDE ?? NaN} text={cur ? fmtEnergy(cur.rmsDE) : '—'} />
          <Item id="emittance" label="beam rms emittance" value={cur?.emittanceRms ?? NaN} text={cur ? `${fmt(cur.emittanceRms)} eV·s` : '—'} />
          <Item id="inside" label="inside bucket / lost" value={cur?.insideFraction ?? NaN} text={cur ? `${fmt(cur.insideFraction * 100)} % / ${cur.lost}` : '—'} />
        </dl>
      </div>
      <CollectiveNumbers setup={valid} m={m} />
      {v.reason ? <p className="warn" role="status">{v.reason}</p> : null}
    </section>
  );
}
