// Editor group "Cycle programs": the momentum program as an editable table (or imported from CSV), the voltage
// and phase programs of each RF system, and the transition switch time taken from the cycle planner.
// Imports go through core/program's apply functions and then validation, like any edit; a bad file changes nothing.
import { withMomentumProgram, withRfProgram, type CsvProgram, type MomentumQuantity } from '../../core/program/index.ts';
import type { SetupInput } from '../../core/setup/schema.ts';
import { editField, setDraft, useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { fmtTime } from '../units.ts';
import { CsvImport } from './CsvImport.tsx';
import { SelectField } from './Field.tsx';
import { ProgramTable } from './ProgramTable.tsx';
import { Section } from './Section.tsx';

const QUANTITY: [string, string][] = [['momentum', 'momentum'], ['kinetic', 'kinetic energy'], ['total', 'total energy'], ['kineticPerNucleon', 'kinetic energy per nucleon'], ['field', 'dipole field']];
const UNIT: Record<string, [string, number]> = { momentum: ['MeV/c', 1e-6], kinetic: ['MeV', 1e-6], total: ['MeV', 1e-6], kineticPerNucleon: ['MeV/u', 1e-6], field: ['T', 1] };
const MOMENTUM_CSV: MomentumQuantity[] = ['momentum', 'kinetic', 'total', 'kineticPerNucleon', 'field'];
// End time of a new RF program when the planner has no cycle length yet [s].
const DEFAULT_END = 0.01;

// Apply a program to the draft; the message of a refusal (e.g. a field program without a bending radius) instead of throwing.
function applied(f: (doc: SetupInput) => SetupInput): string | null {
  try {
    setDraft(f(useApp.getState().draft as SetupInput));
    return null;
  } catch (e) {
    return String((e as Error).message ?? e);
  }
}

function MomentumProgram() {
  const kind = useApp((s) => getIn(s.draft, ['energy', 'ramp', 'kind']));
  const q = String(useApp((s) => getIn(s.draft, ['energy', 'ramp', 'quantity'])));
  const [unit, k] = UNIT[q] ?? ['MeV', 1e-6];
  return (
    <fieldset className="rf-system">
      <legend>Momentum program</legend>
      {kind === 'table' ? (
        <>
          <SelectField path={['energy', 'ramp', 'quantity']} label="Table gives" options={QUANTITY} />
          <p className="field-note">Value at t = 0: the start value of the energy program; linear between points, last value held.</p>
          <ProgramTable path={['energy', 'ramp', 'points']} what={q === 'field' ? 'field' : q} unit={unit} k={k} />
        </>
      ) : (
        <p className="field-note">The ramp is set in the energy program above; a table imported here replaces it.</p>
      )}
      <CsvImport
        id="csv-momentum"
        label="Import momentum table (CSV)…"
        expect={MOMENTUM_CSV}
        example="time_s,momentum_GeV"
        apply={(p: CsvProgram) => applied((d) => withMomentumProgram(d, { ...p, quantity: p.quantity as MomentumQuantity }))}
      />
    </fieldset>
  );
}

function RfProgram(props: { k: number; what: 'voltage' | 'phase' }) {
  const { k, what } = props;
  const path = ['rf', 'systems', k, 'program', what];
  const has = useApp((s) => Array.isArray(getIn(s.draft, path)));
  const end = useApp((s) => (s.cycle.plan ? s.cycle.plan.time[s.cycle.plan.time.length - 1] : DEFAULT_END));
  const [unit, scale] = what === 'voltage' ? ['kV', 1e-3] : ['deg', 1];
  const add = () => {
    const v = getIn(useApp.getState().draft, ['rf', 'systems', k, what]);
    editField(path, [[Number(end.toPrecision(6)), typeof v === 'number' ? v : 0]]);
  };
  return (
    <div className="rf-program">
      <div className="program-head">
        <span>{what === 'voltage' ? 'Voltage' : 'Phase'} against time</span>
        {has ? (
          <button type="button" className="small" id={`prog-${k}-${what}-remove`} onClick={() => editField(path, undefined)}>Remove program</button>
        ) : (
          <button type="button" className="small" id={`prog-${k}-${what}-add`} onClick={add}>Add program</button>
        )}
      </div>
      {has ? <ProgramTable path={path} what={what} unit={unit} k={scale} /> : null}
      <CsvImport
        id={`csv-rf-${k}-${what}`}
        label={`Import ${what} table (CSV)…`}
        expect={[what]}
        example={what === 'voltage' ? 'time_ms,voltage_kV' : 'time_ms,phase_deg'}
        apply={(p) => applied((d) => withRfProgram(d, k, what, p))}
      />
    </div>
  );
}

// The planner's transition time, offered as the slope switch time.
function Transition() {
  const tt = useApp((s) => s.cycle.plan?.transitionTime ?? NaN);
  if (!Number.isFinite(tt)) return <p className="field-note">The cycle does not cross transition.</p>;
  return (
    <div className="program-head">
      <span className="field-note">γ crosses γt at {fmtTime(tt)} (cycle planner).</span>
      <button
        type="button"
        className="small"
        id="prog-use-transition"
        onClick={() => { editField(['rf', 'slope'], 'timed'); editField(['rf', 'switchTime'], Number(tt.toPrecision(6))); }}
      >
        Switch the slope then
      </button>
    </div>
  );
}

/** Momentum and RF programs against time. */
export function ProgramSection() {
  const count = useApp((s) => {
    const v = getIn(s.draft, ['rf', 'systems']);
    return Array.isArray(v) ? v.length : 0;
  });
  return (
    <Section title="Cycle programs" id="programs">
      <MomentumProgram />
      {Array.from({ length: count }, (_, k) => (
        <fieldset className="rf-system" key={k}>
          <legend>{k === 0 ? 'Main RF system' : `RF system ${k + 1}`}</legend>
          <RfProgram k={k} what="voltage" />
          {k > 0 ? <RfProgram k={k} what="phase" /> : null}
        </fieldset>
      ))}
      <Transition />
    </Section>
  );
}
