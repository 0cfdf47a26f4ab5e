// Generators and checks shared by the property tests: mutations of the example files, hostile leaf values,
// random setups drawn from the schema's own ranges, and the check every parse result must pass.
import fc from 'fast-check';
import { readFileSync, readdirSync } from 'node:fs';
import { expect } from 'vitest';
import { setupJsonSchema } from '../core/setup/reference.ts';
import { formatIssue, parseSetup, type ParseResult } from '../core/setup/validate.ts';

type Seg = string | number;
type Json = Record<string, unknown>;

/** The example setup files, parsed JSON. */
export const EXAMPLES: { name: string; doc: Json }[] = readdirSync(new URL('../examples/', import.meta.url))
  .filter((f) => f.endsWith('.json'))
  .map((f) => ({ name: f, doc: JSON.parse(readFileSync(new URL(`../examples/${f}`, import.meta.url), 'utf8')) }));

/** Numbers at the edges of what doubles and the schema allow. */
export const EXTREME_NUMBERS = [0, -0, 1, -1, 0.5, 1e-300, 5e-324, -5e-324, 1e300, -1e300, Number.MAX_VALUE, -Number.MAX_VALUE,
  NaN, Infinity, -Infinity, 2 ** 53 + 2, 2 ** 32, 2 ** 32 - 1, -(2 ** 31), 1e14, 1e16, 1e9 + 0.5];
/** Strings that look like numbers to a person but not to JSON. */
export const NUMBERY_STRINGS = ['NaN', 'Infinity', '-Infinity', '1e999', '-1e999', '0x10', '1,5', '', ' ', '1e', '٣', 'null', 'true', '10 m', '1_000'];

const leaf = fc.oneof(fc.constantFrom(...EXTREME_NUMBERS), fc.constantFrom(...NUMBERY_STRINGS), fc.double(), fc.integer(), fc.string({ maxLength: 8 }), fc.boolean(), fc.constant(null));

/** Ways to damage a document. */
export const MUTATIONS = ['delete', 'replace', 'retype', 'extreme', 'numberString', 'hugeArray', 'deep', 'scale', 'unknownKey', 'swap'] as const;
export type MutationKind = (typeof MUTATIONS)[number];

const mutation = fc.record({
  kind: fc.constantFrom(...MUTATIONS),
  pick: fc.nat(),
  other: fc.nat(),
  json: fc.jsonValue({ maxDepth: 2 }),
  leaf,
  size: fc.integer({ min: 200, max: 3000 }),
  depth: fc.integer({ min: 50, max: 3000 }),
  exp: fc.integer({ min: -30, max: 30 }),
  key: fc.string({ minLength: 1, maxLength: 10 }),
});

// Every path in the document (arrays: first two elements and the last, to keep the list short).
function pathsOf(v: unknown, prefix: Seg[] = [], out: Seg[][] = []): Seg[][] {
  out.push(prefix);
  if (prefix.length > 12) return out; // not into the deep nests an earlier mutation made
  if (Array.isArray(v)) {
    const idx = [...new Set([0, 1, v.length - 1])].filter((i) => i >= 0 && i < v.length);
    for (const i of idx) pathsOf(v[i], [...prefix, i], out);
  } else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) pathsOf(x, [...prefix, k], out);
  return out;
}

function getAt(doc: unknown, p: Seg[]): unknown {
  let v = doc;
  for (const k of p) v = (v as Record<Seg, unknown>)?.[k];
  return v;
}

// Replace the value at p (root: returns the new document).
function putAt(doc: unknown, p: Seg[], value: unknown, remove = false): unknown {
  if (p.length === 0) return value;
  const parent = getAt(doc, p.slice(0, -1)) as Record<Seg, unknown> | unknown[];
  const k = p[p.length - 1];
  if (remove && Array.isArray(parent)) parent.splice(k as number, 1);
  else if (remove) delete (parent as Record<Seg, unknown>)[k];
  else (parent as Record<Seg, unknown>)[k] = value;
  return doc;
}

function retype(v: unknown): unknown {
  if (typeof v === 'number') return String(v);
  if (typeof v === 'string') return Number(v) || v.length;
  if (typeof v === 'boolean') return String(v);
  if (Array.isArray(v)) return Object.fromEntries(v.map((x, i) => [String(i), x]));
  if (v && typeof v === 'object') return Object.values(v);
  return {};
}

function nest(v: unknown, depth: number): unknown {
  let x = v;
  for (let i = 0; i < depth; i++) x = i % 2 ? [x] : { a: x };
  return x;
}

// A copy, or the fallback when the value is nested too deeply to copy (an earlier 'deep' mutation).
function cloneOr(v: unknown, fallback: unknown): unknown {
  try {
    return structuredClone(v ?? null);
  } catch {
    return fallback;
  }
}

type Mutation = typeof mutation extends fc.Arbitrary<infer T> ? T : never;

function apply(doc: unknown, m: Mutation): unknown {
  const paths = pathsOf(doc);
  const p = paths[m.pick % paths.length];
  const cur = getAt(doc, p);
  switch (m.kind) {
    case 'delete':
      return p.length ? putAt(doc, p, undefined, true) : {};
    case 'replace':
      return putAt(doc, p, m.json);
    case 'retype':
      return putAt(doc, p, retype(cur));
    case 'extreme':
      return putAt(doc, p, EXTREME_NUMBERS[m.other % EXTREME_NUMBERS.length]);
    case 'numberString':
      return putAt(doc, p, NUMBERY_STRINGS[m.other % NUMBERY_STRINGS.length]);
    case 'hugeArray':
      return putAt(doc, p, Array.from({ length: m.size }, () => (Array.isArray(cur) && cur.length ? cur[0] : cur ?? m.leaf)));
    case 'deep':
      return putAt(doc, p, nest(cur ?? m.leaf, m.depth));
    case 'scale':
      return putAt(doc, p, typeof cur === 'number' ? cur * 10 ** m.exp : m.leaf);
    case 'unknownKey':
      if (cur && typeof cur === 'object' && !Array.isArray(cur)) (cur as Json)[m.key] = m.leaf;
      return doc;
    case 'swap':
      return putAt(doc, p, cloneOr(getAt(doc, paths[m.other % paths.length]), m.leaf));
  }
}

/** An example file with 1–3 mutations; `kinds` says which. */
export const mutatedExample = fc
  .tuple(fc.nat(EXAMPLES.length - 1), fc.array(mutation, { minLength: 1, maxLength: 3 }))
  .map(([i, ms]) => {
    let doc: unknown = structuredClone(EXAMPLES[i].doc);
    for (const m of ms) doc = apply(doc, m);
    return { doc, kinds: ms.map((m) => m.kind) };
  });

/** What every parse result must satisfy; returns whether it was valid. */
export function checkParse(r: ParseResult): boolean {
  if (r.ok) {
    // A valid setup re-validates, unchanged, from its own JSON (what a file or a link carries).
    const again = parseSetup(JSON.parse(JSON.stringify(r.setup)));
    if (!again.ok) throw new Error(`a valid setup no longer validates: ${again.errors.map(formatIssue).join('; ')}`);
    expect(JSON.stringify(again.setup)).toBe(JSON.stringify(r.setup));
    return true;
  }
  if (!(r.errors.length >= 1 && r.errors.length <= 51)) throw new Error(`${r.errors.length} issues`);
  for (const i of r.errors) {
    const line = formatIssue(i);
    if (typeof i.path !== 'string' || !('value' in i) || typeof i.message !== 'string' || i.message.trim() === '')
      throw new Error(`issue without path, value or message: ${JSON.stringify(i)}`);
    if (!line.startsWith(`${i.path || '(setup)'} = `) || /\n/.test(line) || line.length > 4000) throw new Error(`badly formed issue line: ${line.slice(0, 300)}`);
  }
  return false;
}

// ----- Random setups from the schema's ranges -----

type Js = Json & { properties?: Record<string, Js>; oneOf?: Js[]; items?: Js | false; prefixItems?: Js[]; required?: string[] };

// Fields held small or fixed so a tracked setup stays quick: particle and turn counts, iterations, bin counts.
const OVERRIDES: Record<string, fc.Arbitrary<unknown>> = {
  'beam.particles': fc.integer({ min: 1, max: 300 }),
  'run.turns': fc.constant(100),
  'run.profileBins': fc.integer({ min: 16, max: 512 }),
  'collective.bins': fc.integer({ min: 16, max: 1024 }),
  'collective.matchIterations': fc.integer({ min: 1, max: 20 }),
  title: fc.string({ maxLength: 20 }),
  note: fc.string({ maxLength: 20 }),
};

// A number in [min, max]: an end point, uniform, or log-uniform over the positive part (ranges span decades).
function numberIn(min: number, max: number, integer: boolean): fc.Arbitrary<number> {
  const lo = Math.max(min, Number.MIN_VALUE);
  const logs = max > 0 ? [fc.double({ min: Math.log10(min > 0 ? lo : Math.min(1e-12, max)), max: Math.log10(max), noNaN: true }).map((e) => Math.min(max, Math.max(min, 10 ** e)))] : [];
  const a = fc.oneof(fc.constantFrom(min, max), fc.double({ min, max, noNaN: true }), ...logs);
  return integer ? a.map((x) => Math.min(max, Math.max(min, Math.round(x)))) : a;
}

function fromSchema(s: Js, path: string): fc.Arbitrary<unknown> {
  if (OVERRIDES[path]) return OVERRIDES[path];
  if (s.oneOf) return fc.oneof(...s.oneOf.map((alt) => fromSchema(alt, path)));
  if (s.const !== undefined) return fc.constant(s.const);
  if (s.enum) return fc.constantFrom(...(s.enum as unknown[]));
  if (s.type === 'object') {
    const props = Object.fromEntries(Object.entries(s.properties ?? {}).map(([k, v]) => [k, fromSchema(v, path ? `${path}.${k}` : k)]));
    return fc.record(props, { requiredKeys: s.required ?? [] });
  }
  if (s.type === 'array' && s.prefixItems) return fc.tuple(...s.prefixItems.map((x, i) => fromSchema(x, `${path}[${i}]`)));
  if (s.type === 'array' && s.items) {
    const min = Math.max(Number(s.minItems ?? 0), 0);
    return fc.array(fromSchema(s.items as Js, `${path}[]`), { minLength: min, maxLength: Math.max(min, 3) });
  }
  if (s.type === 'number') return numberIn(Number(s.min ?? -1e6), Number(s.max ?? 1e6), s.integer === true);
  if (s.type === 'boolean') return fc.boolean();
  if (s.type === 'string') return fc.string({ maxLength: 20 });
  return fc.constant(null);
}

/** Setups drawn field by field from the schema's ranges (many break cross-field rules; see `repaired`). */
export const schemaSetup = fromSchema(setupJsonSchema() as Js, '') as fc.Arbitrary<Json>;

/** The same, with the cross-field rules the schema states in words applied, so that most validate. */
export const repairedSetup = schemaSetup.map((d) => repair(structuredClone(d)));

function repair(d: Json): Json {
  const ring = d.ring as Json, rf = d.rf as Json, energy = d.energy as Json;
  if (ring.gammaT !== undefined) delete ring.alpha0;
  else if (ring.alpha0 === undefined) ring.gammaT = 5;
  const ramp = (energy.ramp ?? { kind: 'flat' }) as Json;
  if (ramp.kind === 'bDot' || ramp.quantity === 'field') ring.bendingRadius ??= 10;
  const lepton = (d.particle as Json).kind === 'electron' || (d.particle as Json).kind === 'positron';
  if (lepton && (energy.start as Json).quantity === 'kineticPerNucleon') (energy.start as Json).quantity = 'kinetic';
  if (lepton && ramp.quantity === 'kineticPerNucleon') ramp.quantity = 'kinetic';
  if (ramp.kind === 'smooth') ramp.rounding = Math.min(Number(ramp.rounding ?? 0), Number(ramp.duration) / 2);
  if (Array.isArray(ramp.points)) ramp.points = fixTable(ramp.points);
  const sys = (rf.systems as Json[]).sort((a, b) => Number(a.harmonic) - Number(b.harmonic));
  sys[0].phase = 0;
  for (const s of sys) {
    const prog = s.program as Json | undefined;
    if (prog?.voltage) prog.voltage = fixTable(prog.voltage as number[][]);
    if (prog?.phase) prog.phase = fixTable(prog.phase as number[][]);
  }
  if ((sys[0].program as Json | undefined)?.phase) delete (sys[0].program as Json).phase;
  if (rf.slope === 'timed') rf.switchTime ??= 0.01;
  else delete rf.switchTime;
  if (d.intensity) {
    const i = d.intensity as Json;
    if (i.particlesPerBunch !== undefined) delete i.averageCurrent;
    else i.averageCurrent ??= 0.1;
    i.bunches = 1;
  }
  if (Array.isArray(d.impedances)) {
    d.impedances = (d.impedances as Json[]).filter((z) => z.kind !== 'table');
    for (const z of d.impedances as Json[]) if (z.kind === 'spaceCharge') z.pipeRadius = Math.max(Number(z.pipeRadius), 2 * Number(z.beamRadius));
  }
  const rad = d.radiation as Json | undefined;
  if (rad && (rad.I2 === undefined) !== (rad.I3 === undefined)) { delete rad.I2; delete rad.I3; }
  return d;
}

// Times > 0, non-decreasing, at most two points at one time.
function fixTable(points: number[][]): number[][] {
  const sorted = points.map(([t, v]) => [t > 0 ? t : 1e-3, v]).sort((a, b) => a[0] - b[0]);
  return sorted.filter((p, i) => !(i >= 2 && sorted[i - 2][0] === p[0]));
}
