// CSV import of a program (core/program importProgramCsv): every bad row is listed by its line number and the
// setup is left as it was; a good file goes through the caller's apply function (then validation).
import { useState } from 'react';
import { formatCsvIssue, importProgramCsv, type CsvProgram, type CsvQuantity } from '../../core/program/index.ts';

/** A file picker that reads a program table; `apply` returns an error message or null. */
export function CsvImport(props: { id: string; label: string; expect: readonly CsvQuantity[]; example: string; apply: (p: CsvProgram) => string | null }) {
  const [errors, setErrors] = useState<string[]>([]);
  const [done, setDone] = useState('');
  const onFile = async (f: File | undefined) => {
    if (!f) return;
    const r = importProgramCsv(await f.text(), props.expect);
    if (!r.ok) {
      setDone('');
      setErrors([`${f.name} was not imported; the program is unchanged:`, ...r.errors.map(formatCsvIssue)]);
      return;
    }
    const e = props.apply(r.program);
    setErrors(e ? [`${f.name} was not imported: ${e}`] : []);
    setDone(e ? '' : `${f.name}: ${r.program.points.length} points imported`);
  };
  return (
    <div className="csv-import">
      <label className="csv-button" title={`Header example: ${props.example}`}>
        {props.label}
        <input
          type="file"
          id={props.id}
          accept=".csv,text/csv,text/plain"
          onChange={(e) => {
            void onFile(e.target.files?.[0]);
            e.target.value = ''; // the same file again is a new import
          }}
        />
      </label>
      <span className="unit">header e.g. {props.example}</span>
      {done ? <div className="field-note" id={props.id + '-done'}>{done}</div> : null}
      {errors.length ? (
        <div className="block-error" role="alert" id={props.id + '-error'}>
          {errors.map((e, i) => <div key={i}>{e}</div>)}
        </div>
      ) : null}
    </div>
  );
}
