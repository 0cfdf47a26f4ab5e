// Editor group "Intensity and radiation": beam intensity (particles per bunch or average current, bunches), the
// impedance list, the numerics of the induced voltage, and synchrotron radiation (partition number, radiation
// integrals or the bending radius). Each block can be added and removed; absent blocks cost nothing.
import { editField, useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { NumberField } from './Field.tsx';
import { ImpedanceList } from './ImpedanceList.tsx';
import { Section } from './Section.tsx';

function Intensity() {
  const it = useApp((s) => getIn(s.draft, ['intensity'])) as { particlesPerBunch?: unknown; averageCurrent?: unknown } | undefined;
  if (!it) return <button type="button" className="add" id="add-intensity" onClick={() => editField(['intensity'], { particlesPerBunch: 1e11, bunches: 1 })}>Add beam intensity</button>;
  const byCurrent = it.averageCurrent !== undefined;
  return (
    <fieldset className="rf-system">
      <legend>
        Beam intensity
        <span className="row-tools"><button type="button" aria-label="Remove the beam intensity" onClick={() => editField(['intensity'], undefined)}>✕</button></span>
      </legend>
      <div className="field">
        <label htmlFor="f-intensity-by">Given as</label>
        <div className="field-input">
          <select id="f-intensity-by" value={byCurrent ? 'current' : 'particles'} onChange={(e) => {
            const b = getIn(useApp.getState().draft, ['intensity', 'bunches']);
            editField(['intensity'], e.target.value === 'current' ? { averageCurrent: 0.01, bunches: b ?? 1 } : { particlesPerBunch: 1e11, bunches: b ?? 1 });
          }}>
            <option value="particles">particles per bunch</option>
            <option value="current">average current</option>
          </select>
        </div>
      </div>
      {byCurrent ? <NumberField path={['intensity', 'averageCurrent']} label="Average current" unit="mA" toDisplay={1e3} /> : <NumberField path={['intensity', 'particlesPerBunch']} label="Particles per bunch" />}
      <NumberField path={['intensity', 'bunches']} label="Bunches in the ring" hint="equally spaced; must divide the main harmonic" />
    </fieldset>
  );
}

function Radiation() {
  const r = useApp((s) => getIn(s.draft, ['radiation'])) as { I2?: unknown; damping?: boolean; quantumExcitation?: boolean } | undefined;
  if (!r) return <button type="button" className="add" id="add-radiation" onClick={() => editField(['radiation'], { partitionE: 2, damping: true, quantumExcitation: true })}>Add synchrotron radiation</button>;
  const integrals = r.I2 !== undefined;
  const flag = (k: 'damping' | 'quantumExcitation', label: string) => (
    <label className="check"><input type="checkbox" id={'f-radiation-' + k} checked={r[k] !== false} onChange={(e) => editField(['radiation', k], e.target.checked)} /> {label}</label>
  );
  return (
    <fieldset className="rf-system">
      <legend>
        Synchrotron radiation
        <span className="row-tools"><button type="button" aria-label="Remove synchrotron radiation" onClick={() => editField(['radiation'], undefined)}>✕</button></span>
      </legend>
      <NumberField path={['radiation', 'partitionE']} label="Damping partition J_E" hint="J_E = 2 + D; 2 for an isomagnetic ring without gradient dipoles" />
      <div className="field">
        <label htmlFor="f-radiation-by">Lattice from</label>
        <div className="field-input">
          <select id="f-radiation-by" value={integrals ? 'integrals' : 'radius'} onChange={(e) => {
            const rho = getIn(useApp.getState().draft, ['ring', 'bendingRadius']);
            const p = typeof rho === 'number' ? rho : 10;
            editField(['radiation', 'I2'], e.target.value === 'integrals' ? Number((2 * Math.PI / p).toPrecision(6)) : undefined);
            editField(['radiation', 'I3'], e.target.value === 'integrals' ? Number((2 * Math.PI / (p * p)).toPrecision(6)) : undefined);
          }}>
            <option value="radius">the bending radius (isomagnetic)</option>
            <option value="integrals">radiation integrals I2, I3</option>
          </select>
        </div>
      </div>
      {integrals ? (
        <>
          <NumberField path={['radiation', 'I2']} label="I2 = ∮ds/ρ²" unit="1/m" />
          <NumberField path={['radiation', 'I3']} label="I3 = ∮ds/|ρ|³" unit="1/m²" />
        </>
      ) : null}
      <div className="checks">{flag('damping', 'damping')}{flag('quantumExcitation', 'quantum excitation')}</div>
      <NumberField path={['radiation', 'seed']} label="Seed of the quantum kicks" />
    </fieldset>
  );
}

/** Intensity, impedances, collective numerics and radiation. */
export function CollectiveSection() {
  const used = useApp((s) => getIn(s.draft, ['intensity']) !== undefined || ((getIn(s.draft, ['impedances']) as unknown[] | undefined)?.length ?? 0) > 0);
  return (
    <Section title="Intensity and radiation" id="collective">
      <Intensity />
      <ImpedanceList />
      {used ? (
        <fieldset className="rf-system">
          <legend>Induced-voltage numerics</legend>
          <NumberField path={['collective', 'bins']} label="Line-density bins" />
          <NumberField path={['collective', 'smoothing']} label="Smoothing (rms)" unit="bins" />
          <NumberField path={['collective', 'window']} label="Binning window" unit="ns" toDisplay={1e9} hint="0: automatic (3 × the bunch, at most one RF period)" />
          <NumberField path={['collective', 'matchIterations']} label="Matching iterations (max)" />
          <NumberField path={['collective', 'matchTolerance']} label="Matching tolerance" />
        </fieldset>
      ) : null}
      <Radiation />
      {used ? <p className="field-note">The separatrix in the phase space is that of the RF alone; the Intensity tab shows it with the beam's own field.</p> : null}
    </Section>
  );
}
