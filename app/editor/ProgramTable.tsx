// An editable program table: rows of [time, value] bound to a points array of the draft. Time shows in ms,
// the value in its display unit; text that is not a number is stored as typed, so validation names it.
// Long tables (CSV imports) are shown a page at a time.
import { useEffect, useRef, useState } from 'react';
import { formatIssue } from '../../core/setup/validate.ts';
import { editField, useApp } from '../store.ts';
import { getIn, pathKey, type PathSeg } from '../paths.ts';

const PAGE_ROWS = 20;

function show(v: unknown, k: number): string {
  return typeof v === 'number' ? String(Number((v * k).toPrecision(10))) : v === undefined ? '' : String(v);
}

// One cell; keeps its text while typed, takes outside changes (import, undo of a row).
function Cell(props: { path: PathSeg[]; k: number; label: string }) {
  const value = useApp((s) => getIn(s.draft, props.path));
  const [text, setText] = useState(() => show(value, props.k));
  const written = useRef<unknown>(value);
  useEffect(() => {
    if (!Object.is(value, written.current)) {
      written.current = value;
      setText(show(value, props.k));
    }
  }, [value, props.k]);
  const bad = useApp((s) => s.issues.some((i) => i.path === pathKey(props.path)));
  return (
    <input
      type="text"
      inputMode="decimal"
      aria-label={props.label}
      aria-invalid={bad}
      className={bad ? 'bad' : ''}
      id={'f-' + props.path.join('-')}
      value={text}
      onChange={(e) => {
        const t = e.target.value;
        setText(t);
        const x = t.trim() === '' ? NaN : Number(t);
        const v = Number.isFinite(x) ? Number((x / props.k).toPrecision(15)) : t;
        written.current = v;
        editField(props.path, v);
      }}
    />
  );
}

/** Table of [time, value] points at `path`; `k` converts stored values to the shown unit. */
export function ProgramTable(props: { path: PathSeg[]; what: string; unit: string; k: number }) {
  const n = useApp((s) => {
    const v = getIn(s.draft, props.path);
    return Array.isArray(v) ? v.length : 0;
  });
  const key = pathKey(props.path);
  const issues = useApp((s) => s.issues).filter((i) => i.path === key || i.path.startsWith(key + '['));
  const [page, setPage] = useState(0);
  const pages = Math.max(1, Math.ceil(n / PAGE_ROWS));
  const p = Math.min(page, pages - 1);
  const points = () => (getIn(useApp.getState().draft, props.path) as unknown[]) ?? [];
  const add = () => {
    const pts = points();
    const last = pts[pts.length - 1] as [number, number] | undefined;
    const t = last && typeof last[0] === 'number' ? Number((last[0] * 1.1 + 1e-3).toPrecision(6)) : 1e-3;
    editField(props.path, [...pts, [t, last?.[1] ?? 0]]);
    setPage(Math.floor(pts.length / PAGE_ROWS));
  };
  const remove = (i: number) => editField(props.path, points().filter((_, j) => j !== i));
  const id = 'tbl-' + props.path.join('-');
  return (
    <div className="program-table" id={id}>
      <table>
        <thead>
          <tr><th>#</th><th>time [ms]</th><th>{props.what} [{props.unit}]</th><th /></tr>
        </thead>
        <tbody>
          {Array.from({ length: Math.min(PAGE_ROWS, n - p * PAGE_ROWS) }, (_, r) => {
            const i = p * PAGE_ROWS + r;
            return (
              <tr key={i}>
                <td className="unit">{i + 1}</td>
                <td><Cell path={[...props.path, i, 0]} k={1e3} label={`time of point ${i + 1}`} /></td>
                <td><Cell path={[...props.path, i, 1]} k={props.k} label={`${props.what} of point ${i + 1}`} /></td>
                <td><button type="button" className="small" aria-label={`Remove point ${i + 1}`} disabled={n <= 1} onClick={() => remove(i)}>✕</button></td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <div className="table-tools">
        <button type="button" className="small" onClick={add} id={id + '-add'}>Add point</button>
        {pages > 1 ? (
          <span className="unit">
            <button type="button" className="small" disabled={p === 0} onClick={() => setPage(p - 1)}>‹</button> points {p * PAGE_ROWS + 1}–{Math.min(n, (p + 1) * PAGE_ROWS)} of {n}{' '}
            <button type="button" className="small" disabled={p >= pages - 1} onClick={() => setPage(p + 1)}>›</button>
          </span>
        ) : null}
      </div>
      {issues.length ? (
        <div className="block-error" role="alert" id={id + '-error'}>
          {issues.map((i, k) => <div key={k}>{formatIssue(i)}</div>)}
        </div>
      ) : null}
    </div>
  );
}
