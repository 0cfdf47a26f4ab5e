// Editor group "RF systems": a list of cavities (harmonic, voltage, phase, position), with add, remove and
// reorder. The first system is the main one (lowest harmonic, phase 0); validation says so if not.
import { editField, useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { BlockIssues, NumberField, SelectField } from './Field.tsx';
import { Section } from './Section.tsx';

const SLOPES: [string, string][] = [
  ['auto', 'automatic (follows the slip factor)'], ['rising', 'rising (below transition)'], ['falling', 'falling (above transition)'],
  ['timed', 'switch at a set time'],
];
const MAX_SYSTEMS = 8;

function systems(): unknown[] {
  const v = getIn(useApp.getState().draft, ['rf', 'systems']);
  return Array.isArray(v) ? v : [];
}

function move(i: number, d: number): void {
  const list = [...systems()];
  const j = i + d;
  if (j < 0 || j >= list.length) return;
  [list[i], list[j]] = [list[j], list[i]];
  editField(['rf', 'systems'], list);
}

function remove(i: number): void {
  editField(['rf', 'systems'], systems().filter((_, k) => k !== i));
}

// A new system: second harmonic of the main one at half its voltage, a common first addition.
function add(): void {
  const list = systems();
  const main = (list[0] ?? {}) as { harmonic?: unknown; voltage?: unknown };
  const h = typeof main.harmonic === 'number' ? main.harmonic : 1;
  const v = typeof main.voltage === 'number' ? main.voltage : 10e3;
  editField(['rf', 'systems'], [...list, { harmonic: 2 * h, voltage: v / 2, phase: 180, position: 0 }]);
}

/** The RF systems list. */
export function RfSection() {
  const count = useApp((s) => {
    const v = getIn(s.draft, ['rf', 'systems']);
    return Array.isArray(v) ? v.length : 0;
  });
  const timed = useApp((s) => getIn(s.draft, ['rf', 'slope']) === 'timed');
  return (
    <Section title="RF systems" id="rf">
      <BlockIssues path={['rf', 'systems']} />
      {Array.from({ length: count }, (_, i) => (
        <fieldset className="rf-system" key={i}>
          <legend>
            {i === 0 ? 'Main system' : `System ${i + 1}`}
            <span className="row-tools">
              <button type="button" title="Move up" aria-label={`Move system ${i + 1} up`} disabled={i === 0} onClick={() => move(i, -1)}>↑</button>
              <button type="button" title="Move down" aria-label={`Move system ${i + 1} down`} disabled={i === count - 1} onClick={() => move(i, 1)}>↓</button>
              <button type="button" title="Remove" aria-label={`Remove system ${i + 1}`} disabled={count === 1} onClick={() => remove(i)}>✕</button>
            </span>
          </legend>
          <NumberField path={['rf', 'systems', i, 'harmonic']} label="Harmonic number h" />
          <NumberField path={['rf', 'systems', i, 'voltage']} label="Peak voltage" unit="kV" toDisplay={1e-3} />
          <NumberField path={['rf', 'systems', i, 'phase']} label="Phase offset" unit="deg" hint="in this system's own degrees; 180 for bunch lengthening" />
          <NumberField path={['rf', 'systems', i, 'position']} label="Position around the ring" unit="of C" hint="fraction of the circumference, 0 to < 1" />
          <ProgramNote i={i} />
        </fieldset>
      ))}
      <button type="button" className="add" disabled={count >= MAX_SYSTEMS} onClick={add}>
        Add RF system
      </button>
      <SelectField
        path={['rf', 'slope']}
        label="Stable slope"
        options={SLOPES}
        onPick={(v) => {
          editField(['rf', 'slope'], v);
          // Prefilled with the time γ crosses γt when the cycle planner found one.
          const tt = useApp.getState().cycle.plan?.transitionTime ?? NaN;
          editField(['rf', 'switchTime'], v === 'timed' ? (Number.isFinite(tt) ? Number(tt.toPrecision(6)) : 0.01) : undefined);
        }}
      />
      {timed ? <NumberField path={['rf', 'switchTime']} label="Slope switch at" unit="ms" toDisplay={1e3} /> : null}
    </Section>
  );
}

// Voltage and phase programs are tables: edited under Cycle programs (ProgramSection), summarised here.
function ProgramNote(props: { i: number }) {
  const prog = useApp((s) => getIn(s.draft, ['rf', 'systems', props.i, 'program'])) as { voltage?: unknown[]; phase?: unknown[] } | undefined;
  if (!prog) return null;
  const parts = [prog.voltage ? `voltage (${prog.voltage.length} points)` : '', prog.phase ? `phase (${prog.phase.length} points)` : ''].filter(Boolean);
  return <p className="field-note">Program in time: {parts.join(', ')}; edit it under Cycle programs.</p>;
}
