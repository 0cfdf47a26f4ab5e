// Editor inputs bound to a path of the draft setup. A number shows in its display unit and is stored in the
// schema unit; text that is not a number is stored as typed, so validation names the exact value given.
import { useEffect, useRef, useState, type ReactNode } from 'react';
import type { Setup } from '../../core/setup/schema.ts';
import { formatIssue, type SetupIssue } from '../../core/setup/validate.ts';
import { setupWarnings } from '../../core/setup/warnings.ts';
import { editField, useApp } from '../store.ts';
import { getIn, pathKey, type PathSeg } from '../paths.ts';

/** DOM id of the input for a path (tests and labels use it). */
export function fieldId(path: readonly PathSeg[]): string {
  return 'f-' + path.join('-');
}

function show(v: unknown, toDisplay: number): string {
  if (typeof v === 'number') return String(Number((v * toDisplay).toPrecision(10)));
  return v === undefined ? '' : String(v);
}

/** Issues of the draft at exactly this path (or the tracker's objection to it), as one line each. */
export function useIssues(path: readonly PathSeg[]): string[] {
  const key = pathKey(path);
  const issues = useApp((s) => s.issues);
  const run = useApp((s) => s.runIssue);
  const lines = issues.filter((i) => i.path === key).map(formatIssue);
  return run && run.path === key && lines.length === 0 ? [run.text] : lines;
}

// Warnings of the running setup, computed once per setup object.
let warned: { setup: Setup; list: SetupIssue[] } | null = null;
function warningsOf(setup: Setup): SetupIssue[] {
  if (warned?.setup !== setup) warned = { setup, list: setupWarnings(setup) };
  return warned.list;
}

/** Warnings of the running setup at exactly this path (it runs, but the user should know), one line each. */
export function useWarnings(path: readonly PathSeg[]): string[] {
  const key = pathKey(path);
  const valid = useApp((s) => s.valid);
  return warningsOf(valid).filter((w) => w.path === key).map((w) => `warning: ${formatIssue(w)}`);
}

function Row(props: { id: string; path: readonly PathSeg[]; label: string; unit?: string; errors: string[]; children: ReactNode; hint?: string }) {
  const warnings = useWarnings(props.path);
  return (
    <div className={'field' + (props.errors.length ? ' invalid' : '')} title={props.hint}>
      <label htmlFor={props.id}>{props.label}</label>
      <div className="field-input">
        {props.children}
        {props.unit ? <span className="unit">{props.unit}</span> : null}
      </div>
      {props.errors.map((e) => (
        <div key={e} className="field-error" role="alert" id={props.id + '-error'}>
          {e}
        </div>
      ))}
      {props.errors.length === 0 && warnings.length ? (
        <div className="field-note" role="status" id={props.id + '-warning'} style={{ gridColumn: '1 / -1', color: '#8a4b00' }}>
          {warnings.join(' ')}
        </div>
      ) : null}
    </div>
  );
}

/** A number field; `toDisplay` converts the stored value to the shown one (e.g. 1e9 for s → ns). */
export function NumberField(props: { path: PathSeg[]; label: string; unit?: string; toDisplay?: number; hint?: string; optional?: boolean }) {
  const k = props.toDisplay ?? 1;
  const id = fieldId(props.path);
  const value = useApp((s) => getIn(s.draft, props.path));
  const errors = useIssues(props.path);
  const [text, setText] = useState(() => show(value, k));
  // The value this input last wrote: any other value came from outside (preset, file, link) and replaces the
  // text even while the input has focus; our own writes leave the text as typed ("2.50", "1e").
  const written = useRef<unknown>(value);
  useEffect(() => {
    if (!Object.is(value, written.current)) {
      written.current = value;
      setText(show(value, k));
    }
  }, [value, k]);
  const onChange = (t: string) => {
    setText(t);
    const x = t.trim() === '' ? NaN : Number(t);
    const v = props.optional && t.trim() === '' ? undefined : Number.isFinite(x) ? Number((x / k).toPrecision(15)) : t;
    written.current = v;
    editField(props.path, v); // undefined removes an optional field
  };
  return (
    <Row id={id} path={props.path} label={props.label} unit={props.unit} errors={errors} hint={props.hint}>
      <input
        id={id}
        type="text"
        inputMode="decimal"
        spellCheck={false}
        aria-invalid={errors.length > 0}
        value={text}
        onChange={(e) => onChange(e.target.value)}
        onBlur={() => setText(show(value, k))}
      />
    </Row>
  );
}

/** A choice among fixed strings; `onPick` may rebuild the enclosing object (e.g. a union's kind). */
export function SelectField(props: {
  path: PathSeg[];
  label: string;
  options: [string, string][];
  onPick?: (v: string) => void;
  hint?: string;
}) {
  const id = fieldId(props.path);
  const value = useApp((s) => getIn(s.draft, props.path));
  const errors = useIssues(props.path);
  return (
    <Row id={id} path={props.path} label={props.label} errors={errors} hint={props.hint}>
      <select id={id} value={String(value ?? '')} onChange={(e) => (props.onPick ? props.onPick(e.target.value) : editField(props.path, e.target.value))}>
        {props.options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </Row>
  );
}

/** Errors attached to a whole block (e.g. "rf.systems"), shown under its heading. */
export function BlockIssues(props: { path: PathSeg[] }) {
  const errors = useIssues(props.path);
  return errors.length ? (
    <div className="block-error" role="alert">
      {errors.map((e) => (
        <div key={e}>{e}</div>
      ))}
    </div>
  ) : null;
}
