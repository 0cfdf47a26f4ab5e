// Parse, migrate and validate a setup document. Never throws: returns the setup or a list of errors, each
// naming the field (dotted path), the value given and what is allowed.
import type { z } from 'zod';
import { makeParticle } from '../particle.ts';
import { fmtNum } from './fields.ts';
import { migrate } from './migrate.ts';
import { setupSchema, type Setup } from './schema.ts';
import { rampErrors } from './warnings.ts';

export interface SetupIssue {
  /** Dotted field path, e.g. "rf.systems[0].voltage". */
  path: string;
  /** The value found there (undefined if missing). */
  value: unknown;
  message: string;
}

export type ParseResult = { ok: true; setup: Setup; migratedFrom?: number } | { ok: false; errors: SetupIssue[] };

/** One line per issue: `path = value: message`. */
export function formatIssue(i: SetupIssue): string {
  return `${i.path || '(setup)'} = ${showValue(i.value)}: ${i.message.replace(/\s*\n\s*/g, ' ')}`; // one line, whatever the message
}

/** Validate an already-parsed JSON value (migrating older versions first). */
export function parseSetup(input: unknown): ParseResult {
  const m = migrate(input);
  if (!m.ok) return { ok: false, errors: [m.error] };
  let r: ReturnType<typeof setupSchema.safeParse>;
  try {
    r = setupSchema.safeParse(m.doc);
  } catch (e) {
    // The validator itself can run out of stack on pathological input (e.g. a million bad list items).
    return { ok: false, errors: [{ path: '', value: undefined, message: `the document is too large or too deeply nested to check (${(e as Error).message})` }] };
  }
  if (!r.success) return { ok: false, errors: firstIssues(r.error.issues.map((i) => toIssue(i, m.doc))) };
  const extra = crossChecks(r.data);
  if (extra.length) return { ok: false, errors: extra };
  return m.from === undefined ? { ok: true, setup: r.data } : { ok: true, setup: r.data, migratedFrom: m.from };
}

/** Validate JSON text. */
export function parseSetupText(text: string): ParseResult {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    return { ok: false, errors: [{ path: '', value: text.slice(0, 40), message: `not valid JSON (${(e as Error).message})` }] };
  }
  return parseSetup(doc);
}

// A long table full of bad points would list thousands of lines: keep the first ones and say how many more.
const MAX_ISSUES = 50;
function firstIssues(all: SetupIssue[]): SetupIssue[] {
  if (all.length <= MAX_ISSUES) return all;
  const next = all[MAX_ISSUES];
  return [...all.slice(0, MAX_ISSUES), { ...next, message: `${next.message} (and ${all.length - MAX_ISSUES - 1} more problems not listed)` }];
}

const MAX_HARMONIC_RATIO = 1000;
// Narrowest line-density bin accepted [s]: far below any bunch this tool tracks.
const MIN_BIN_S = 1e-18;

// Combinations the schema cannot express field by field.
function crossChecks(s: Setup): SetupIssue[] {
  const out: SetupIssue[] = [];
  const p = makeParticle(s.particle);
  const st = s.energy.start;
  if (st.quantity === 'total' && st.value <= p.mass)
    out.push({ path: 'energy.start.value', value: st.value, message: `total energy must exceed the rest energy ${fmtNum(p.mass)} eV` });
  if (st.quantity === 'kineticPerNucleon' && p.A === 0)
    out.push({ path: 'energy.start.quantity', value: st.quantity, message: 'energy per nucleon needs an ion or a proton' });
  if (s.energy.ramp.kind === 'bDot' && s.ring.bendingRadius === undefined)
    out.push({ path: 'ring.bendingRadius', value: undefined, message: 'a B-field ramp (bDot) needs the bending radius' });
  const h = s.rf.systems[0].harmonic, M = s.intensity?.bunches ?? 1;
  // The RF wave is sampled 50 times per period of the highest harmonic on every turn: bound the ratio.
  s.rf.systems.forEach((r, k) => {
    if (r.harmonic > MAX_HARMONIC_RATIO * h)
      out.push({ path: `rf.systems[${k}].harmonic`, value: r.harmonic, message: `must be at most ${MAX_HARMONIC_RATIO} × the main harmonic h = ${h}, i.e. in [${h}, ${MAX_HARMONIC_RATIO * h}]` });
  });
  if (h % M !== 0) out.push({ path: 'intensity.bunches', value: M, message: `must divide the main harmonic number h = ${h} (equally spaced bunches)` });
  const w = s.collective.window, bins = s.collective.bins;
  if (w > 0 && !(w / bins >= MIN_BIN_S)) // a denormal window gave zero-width bins and a throw at tracking
    out.push({ path: 'collective.window', value: w, message: `gives bins of ${fmtNum(w / bins)} s: give 0 (automatic) or a window in [${fmtNum(MIN_BIN_S * bins)}, 1] s for ${bins} bins` });
  if (s.radiation && s.radiation.I2 === undefined && s.ring.bendingRadius === undefined)
    out.push({ path: 'radiation.I2', value: undefined, message: 'give radiation.I2 and radiation.I3, or ring.bendingRadius (isomagnetic ring)' });
  if (!out.length) out.push(...rampErrors(s));
  return out;
}

function toIssue(i: z.core.$ZodIssue, doc: unknown): SetupIssue {
  const path = i.path.map((k) => (typeof k === 'number' ? `[${k}]` : `.${String(k)}`)).join('').replace(/^\./, '');
  let message = i.message;
  if (i.code === 'unrecognized_keys')
    message = `unknown field(s): ${i.keys.slice(0, 10).join(', ')}${i.keys.length > 10 ? ` and ${i.keys.length - 10} more` : ''}`;
  if (i.code === 'invalid_union' || i.code === 'invalid_value' || i.code === 'invalid_type') message = i.message.replace(/^Invalid input: /, '');
  if (message === 'Required' || /received undefined/.test(message)) message = 'is required';
  return { path, value: valueAt(doc, i.path), message };
}

function valueAt(doc: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = doc;
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[k];
  }
  return v;
}

function showValue(v: unknown): string {
  if (v === undefined) return '(missing)';
  if (typeof v === 'number') return fmtNum(v);
  const s = preview(v, SHOW_CHARS + 1);
  return s.length > SHOW_CHARS ? s.slice(0, SHOW_CHARS - 3) + '...' : s;
}

const SHOW_CHARS = 60;

// JSON text of v, cut after about `budget` characters: visits only what is shown, so deeply nested or huge
// values (a hostile file or link) cost little and cannot overflow the stack.
function preview(v: unknown, budget: number): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v) ?? String(v);
  const parts: string[] = [];
  let used = 2;
  const entries: [string, unknown][] = Array.isArray(v) ? v.map((x) => ['', x]) : Object.entries(v as object);
  for (const [k, x] of entries) {
    if (used >= budget) break;
    const key = Array.isArray(v) ? '' : JSON.stringify(k) + ':';
    const part = key + preview(x, budget - used - key.length);
    parts.push(part);
    used += part.length + 1;
  }
  return Array.isArray(v) ? `[${parts.join(',')}]` : `{${parts.join(',')}}`;
}
