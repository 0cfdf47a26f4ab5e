// The impedance list of the editor: resonators, inductive Im Z/n, space charge (from the beam and pipe radii)
// and tables imported from CSV (importImpedanceCsv, errors by line number; a bad file changes nothing).
import { useState } from 'react';
import { importImpedanceCsv } from '../../core/collective/index.ts';
import { editField, useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { BlockIssues, NumberField, SelectField } from './Field.tsx';

const MAX_IMPEDANCES = 64;
// A harmless new model of each kind (a broad-band resonator, a small inductive term, a round pipe).
const NEW: Record<string, object> = {
  resonator: { kind: 'resonator', shuntImpedance: 5000, quality: 1, frequency: 1e9 },
  inductive: { kind: 'inductive', imZOverN: 1 },
  spaceCharge: { kind: 'spaceCharge', beamRadius: 0.01, pipeRadius: 0.05, geometry: 'onAxis' },
};
const ADD_LABEL: Record<string, string> = { resonator: 'resonator', inductive: 'inductive Im Z/n', spaceCharge: 'space charge' };
const TITLE: Record<string, string> = { resonator: 'Resonator', inductive: 'Inductive Im Z/n', spaceCharge: 'Space charge', table: 'Impedance table' };

function list(): unknown[] {
  const v = getIn(useApp.getState().draft, ['impedances']);
  return Array.isArray(v) ? v : [];
}

function Model(props: { i: number }) {
  const i = props.i;
  const P = (k: string) => ['impedances', i, k];
  const kind = String(useApp((s) => getIn(s.draft, P('kind'))));
  const rows = useApp((s) => (getIn(s.draft, P('frequency')) as unknown[] | undefined)?.length ?? 0);
  const label = useApp((s) => getIn(s.draft, P('label')));
  return (
    <fieldset className="rf-system">
      <legend>
        {TITLE[kind] ?? kind}
        <span className="row-tools">
          <button type="button" aria-label={`Remove impedance ${i + 1}`} onClick={() => editField(['impedances'], list().filter((_, k) => k !== i))}>✕</button>
        </span>
      </legend>
      {kind === 'resonator' ? (
        <>
          <NumberField path={P('shuntImpedance')} label="Shunt impedance Rs" unit="kΩ" toDisplay={1e-3} />
          <NumberField path={P('quality')} label="Quality factor Q" />
          <NumberField path={P('frequency')} label="Resonant frequency" unit="MHz" toDisplay={1e-6} />
        </>
      ) : kind === 'inductive' ? (
        <NumberField path={P('imZOverN')} label="Im Z/n" unit="Ω" hint="positive: inductive, negative: capacitive" />
      ) : kind === 'spaceCharge' ? (
        <>
          <NumberField path={P('beamRadius')} label="Beam radius a" unit="mm" toDisplay={1e3} />
          <NumberField path={P('pipeRadius')} label="Pipe radius b" unit="mm" toDisplay={1e3} />
          <SelectField path={P('geometry')} label="Geometry factor" options={[['onAxis', 'on axis: 1 + 2 ln(b/a)'], ['averaged', 'averaged: 0.5 + 2 ln(b/a)']]} />
        </>
      ) : (
        <p className="field-note">{rows} rows{label ? ` from ${String(label)}` : ''}; import a new file to replace it.</p>
      )}
    </fieldset>
  );
}

// CSV import of a Z(f) table; the convention of the file decides the sign of Im Z.
function TableImport() {
  const [convention, setConvention] = useState<'engineering' | 'physics'>('engineering');
  const [errors, setErrors] = useState<string[]>([]);
  const onFile = async (f: File | undefined) => {
    if (!f) return;
    const r = importImpedanceCsv(await f.text(), convention, f.name);
    if (!r.ok) {
      setErrors([`${f.name} was not imported; the impedances are unchanged:`, ...r.errors.map((e) => (e.line > 0 ? `line ${e.line}: ${e.message}` : e.message))]);
      return;
    }
    setErrors([]);
    editField(['impedances'], [...list(), r.table]);
  };
  return (
    <div className="csv-import">
      <label className="csv-button" title="Header example: frequency_GHz,re_Ohm,im_Ohm">
        Import Z(f) table (CSV)…
        <input type="file" id="csv-impedance" accept=".csv,text/csv,text/plain" onChange={(e) => { void onFile(e.target.files?.[0]); e.target.value = ''; }} />
      </label>
      <select id="csv-impedance-convention" value={convention} onChange={(e) => setConvention(e.target.value as 'engineering' | 'physics')} title="Sign convention of the file's Im Z">
        <option value="engineering">e^(+jωt): Im Z &gt; 0 inductive</option>
        <option value="physics">e^(−iωt): Im Z &lt; 0 inductive</option>
      </select>
      {errors.length ? <div className="block-error" role="alert" id="csv-impedance-error">{errors.map((e, i) => <div key={i}>{e}</div>)}</div> : null}
    </div>
  );
}

/** All impedance models, with add, remove and CSV import. */
export function ImpedanceList() {
  const n = useApp((s) => (getIn(s.draft, ['impedances']) as unknown[] | undefined)?.length ?? 0);
  return (
    <>
      <BlockIssues path={['impedances']} />
      {Array.from({ length: n }, (_, i) => <Model key={i} i={i} />)}
      <div className="table-tools">
        {Object.keys(NEW).map((k) => (
          <button key={k} type="button" className="small" id={'add-impedance-' + k} disabled={n >= MAX_IMPEDANCES} onClick={() => editField(['impedances'], [...list(), NEW[k]])}>
            + {ADD_LABEL[k]}
          </button>
        ))}
      </div>
      <TableImport />
    </>
  );
}
