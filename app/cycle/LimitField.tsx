// A number input checked against a range as typed: a bad value stays in the field with a message naming the
// field, the value and the allowed range; only a good value is passed on.
import { useState } from 'react';

// Bounds as a person writes them: 1e-6, not 0.000001.
const bound = (x: number) => (x !== 0 && Math.abs(x) < 1e-3 ? x.toExponential() : String(x));

/** Labelled number input with its own range check. */
export function LimitField(props: { id: string; label: string; name: string; value: number; lo: number; hi: number; unit?: string; onValue: (v: number) => void }) {
  const [text, setText] = useState(String(props.value));
  const x = Number(text);
  const bad = text.trim() === '' || !Number.isFinite(x) || x < props.lo || x > props.hi;
  return (
    <span className={'limit' + (bad ? ' invalid' : '')}>
      <label htmlFor={props.id}>{props.label}</label>
      <input
        id={props.id}
        type="text"
        inputMode="decimal"
        value={text}
        aria-invalid={bad}
        onChange={(e) => {
          setText(e.target.value);
          const v = Number(e.target.value);
          if (e.target.value.trim() !== '' && Number.isFinite(v) && v >= props.lo && v <= props.hi) props.onValue(v);
        }}
      />
      {props.unit ? <span className="unit">{props.unit}</span> : null}
      {bad ? (
        <span className="field-error" role="alert" id={props.id + '-error'}>
          {props.name} = {text.trim() === '' ? '(empty)' : text}: must be a number in [{bound(props.lo)}, {bound(props.hi)}]
        </span>
      ) : null}
    </span>
  );
}
