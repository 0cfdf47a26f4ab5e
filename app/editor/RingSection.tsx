// Editor groups "Ring and particle" and "Energy program".
import { editField, useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { NumberField, SelectField } from './Field.tsx';
import { Section } from './Section.tsx';

const PARTICLES: [string, string][] = [['proton', 'proton'], ['ion', 'ion'], ['electron', 'electron'], ['positron', 'positron']];
const QUANTITY: [string, string][] = [['kinetic', 'kinetic energy'], ['total', 'total energy'], ['momentum', 'momentum'], ['kineticPerNucleon', 'kinetic energy per nucleon']];
const QUANTITY_UNIT: Record<string, string> = { kinetic: 'MeV', total: 'MeV', momentum: 'MeV/c', kineticPerNucleon: 'MeV/u' };
const RAMPS: [string, string][] = [
  ['flat', 'flat top (no ramp)'], ['gainPerTurn', 'energy gain per turn'], ['bDot', 'dipole field rate'], ['momentumRate', 'momentum rate'],
  ['smooth', 'smooth ramp to a target'], ['table', 'program table (time, value)'],
];
const PROGRAM_QUANTITY: [string, string][] = [['momentum', 'momentum'], ['kinetic', 'kinetic energy'], ['total', 'total energy'], ['kineticPerNucleon', 'kinetic energy per nucleon'], ['field', 'dipole field']];
const PROGRAM_UNIT: Record<string, [string, number]> = { momentum: ['MeV/c', 1e-6], kinetic: ['MeV', 1e-6], total: ['MeV', 1e-6], kineticPerNucleon: ['MeV/u', 1e-6], field: ['T', 1] };
// Display unit and factor for each ramp value (stored in eV, T/s, eV/s).
const RAMP_UNIT: Record<string, [string, number]> = { gainPerTurn: ['keV', 1e-3], bDot: ['T/s', 1], momentumRate: ['GeV/c per s', 1e-9] };

/** Ring lattice numbers and the particle species. */
export function RingSection() {
  const kind = useApp((s) => getIn(s.draft, ['particle', 'kind']));
  const byGammaT = useApp((s) => getIn(s.draft, ['ring', 'alpha0']) === undefined);
  return (
    <Section title="Ring and particle" id="ring">
      <SelectField
        path={['particle', 'kind']}
        label="Particle"
        options={PARTICLES}
        onPick={(k) => editField(['particle'], k === 'ion' ? { kind: 'ion', massNumber: 208, chargeState: 54 } : { kind: k })}
      />
      {kind === 'ion' ? (
        <>
          <NumberField path={['particle', 'massNumber']} label="Mass number A" />
          <NumberField path={['particle', 'chargeState']} label="Charge state Z" unit="e" />
          <NumberField path={['particle', 'atomicMass']} label="Atomic mass" unit="u" optional hint="empty: the mass number" />
        </>
      ) : null}
      <NumberField path={['ring', 'circumference']} label="Circumference" unit="m" />
      <div className="field">
        <label htmlFor="f-compaction">Compaction given as</label>
        <div className="field-input">
          <select
            id="f-compaction"
            value={byGammaT ? 'gammaT' : 'alpha0'}
            onChange={(e) => {
              const d = useApp.getState().draft;
              const g = getIn(d, ['ring', 'gammaT']), a = getIn(d, ['ring', 'alpha0']);
              if (e.target.value === 'alpha0') {
                editField(['ring', 'gammaT'], undefined);
                editField(['ring', 'alpha0'], typeof g === 'number' ? Number((1 / (g * g)).toPrecision(8)) : 0.04);
              } else {
                editField(['ring', 'alpha0'], undefined);
                editField(['ring', 'gammaT'], typeof a === 'number' && a > 0 ? Number((1 / Math.sqrt(a)).toPrecision(8)) : 5);
              }
            }}
          >
            <option value="gammaT">transition gamma γt</option>
            <option value="alpha0">momentum compaction α0</option>
          </select>
        </div>
      </div>
      {byGammaT ? <NumberField path={['ring', 'gammaT']} label="Transition gamma γt" /> : <NumberField path={['ring', 'alpha0']} label="Momentum compaction α0" />}
      <NumberField path={['ring', 'alpha1']} label="Second-order compaction α1" />
      <NumberField path={['ring', 'alpha2']} label="Third-order compaction α2" />
      <NumberField path={['ring', 'bendingRadius']} label="Bending radius" unit="m" optional hint="needed for a dipole-field ramp" />
    </Section>
  );
}

/** Start energy and the ramp. */
export function EnergySection() {
  const q = String(useApp((s) => getIn(s.draft, ['energy', 'start', 'quantity'])));
  const ramp = String(useApp((s) => getIn(s.draft, ['energy', 'ramp', 'kind'])));
  const [rampUnit, rampK] = RAMP_UNIT[ramp] ?? ['', 1];
  return (
    <Section title="Energy program" id="energy">
      <SelectField path={['energy', 'start', 'quantity']} label="Start given as" options={QUANTITY} />
      <NumberField path={['energy', 'start', 'value']} label="Start value" unit={QUANTITY_UNIT[q] ?? 'MeV'} toDisplay={1e-6} />
      <SelectField
        path={['energy', 'ramp', 'kind']}
        label="Ramp"
        options={RAMPS}
        onPick={(k) => editField(['energy', 'ramp'], newRamp(k))}
      />
      {RAMP_UNIT[ramp] ? <NumberField path={['energy', 'ramp', 'value']} label="Ramp rate" unit={rampUnit} toDisplay={rampK} /> : null}
      {ramp === 'smooth' ? <SmoothRamp /> : null}
      {ramp === 'table' ? <TableNote /> : null}
    </Section>
  );
}

// A new ramp of a kind, with a harmless starting value.
function newRamp(k: string): unknown {
  if (k === 'flat') return { kind: k };
  if (k === 'smooth') {
    const start = getIn(useApp.getState().draft, ['energy', 'start', 'value']);
    return { kind: k, quantity: 'kinetic', target: typeof start === 'number' ? 2 * start : 1e9, start: 0, duration: 0.1, rounding: 0.01 };
  }
  if (k === 'table') return { kind: k, quantity: 'kinetic', points: [[0.1, 1e9]] };
  return { kind: k, value: k === 'bDot' ? 1 : k === 'gainPerTurn' ? 1000 : 1e10 };
}

function SmoothRamp() {
  const q = String(useApp((s) => getIn(s.draft, ['energy', 'ramp', 'quantity'])));
  const [unit, k] = PROGRAM_UNIT[q] ?? ['', 1];
  const R = ['energy', 'ramp'];
  return (
    <>
      <SelectField path={[...R, 'quantity']} label="Target given as" options={PROGRAM_QUANTITY} />
      <NumberField path={[...R, 'target']} label="Target" unit={unit} toDisplay={k} />
      <NumberField path={[...R, 'start']} label="Leaves the flat bottom at" unit="ms" toDisplay={1e3} />
      <NumberField path={[...R, 'duration']} label="Duration" unit="ms" toDisplay={1e3} />
      <NumberField path={[...R, 'rounding']} label="Parabolic ends" unit="ms" toDisplay={1e3} />
    </>
  );
}

// Tables are long lists of points: edited in the setup file, summarised here.
function TableNote() {
  const pts = useApp((s) => getIn(s.draft, ['energy', 'ramp', 'points']));
  const q = String(useApp((s) => getIn(s.draft, ['energy', 'ramp', 'quantity'])));
  const n = Array.isArray(pts) ? pts.length : 0;
  return (
    <p className="field-note">
      {n} point{n === 1 ? '' : 's'} of {q} against time; edit the table in the setup file (Save setup, then Load setup).
    </p>
  );
}
