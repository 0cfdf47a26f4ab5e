// Property: parseSetup and parseSetupText never throw. Whatever they are given (random JSON, setup-shaped
// random documents, damaged example files, damaged JSON text), they return a valid setup that re-validates
// unchanged from its own JSON, or issues that each name a path, the value and a message on one line.
import './fcSeed.ts';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { parseSetup, parseSetupText } from '../core/setup/validate.ts';
import { checkParse, EXAMPLES, mutatedExample, repairedSetup, schemaSetup } from './property-arbitraries.ts';

const counts: Record<string, number> = {};
const tally = (kind: string) => (counts[kind] = (counts[kind] ?? 0) + 1);
const mutations: Record<string, number> = {};

afterAll(() => {
  const total = Object.values(counts).reduce((a, b) => a + b, 0);
  const list = (r: Record<string, number>) => Object.entries(r).map(([k, n]) => `${k} ${n}`).join(', ');
  console.log(`property-setup: ${total} inputs (${list(counts)}); mutations applied: ${list(mutations)}`);
});

describe('parseSetup on hostile input', () => {
  it('random JSON values', () => {
    fc.assert(fc.property(fc.jsonValue({ maxDepth: 4 }), (v) => { tally('random JSON'); checkParse(parseSetup(v)); }), { numRuns: 12_000 });
  });

  it('objects with version 1 and random fields', () => {
    const doc = fc.dictionary(fc.constantFrom('particle', 'ring', 'energy', 'rf', 'beam', 'run', 'intensity', 'impedances', 'collective', 'radiation', 'title', 'x'), fc.jsonValue({ maxDepth: 3 }));
    fc.assert(fc.property(doc, (d) => { tally('random fields'); checkParse(parseSetup({ version: 1, ...d })); }), { numRuns: 6_000 });
  });

  it('setups drawn from the schema ranges, half with the cross-field rules applied', () => {
    let valid = 0;
    fc.assert(fc.property(fc.oneof(schemaSetup, repairedSetup), (d) => { tally('from schema ranges'); if (checkParse(parseSetup(d))) valid++; }), { numRuns: 10_000 });
    expect(valid).toBeGreaterThan(100); // both branches of the check are exercised
  });

  it('example files with 1–3 mutations (delete, replace, retype, extreme numbers, NaN strings, huge arrays, deep nesting, ...)', () => {
    let valid = 0;
    fc.assert(
      fc.property(mutatedExample, ({ doc, kinds }) => {
        tally('mutated examples');
        for (const k of kinds) mutations[k] = (mutations[k] ?? 0) + 1;
        if (checkParse(parseSetup(doc))) valid++;
      }),
      { numRuns: 42_000 },
    );
    expect(valid).toBeGreaterThan(100); // e.g. scaled numbers that stay in range
  });

  it('damaged JSON text: cut, spliced, characters replaced', () => {
    const texts = EXAMPLES.map((e) => JSON.stringify(e.doc, null, 1));
    const damaged = fc.tuple(fc.nat(texts.length - 1), fc.nat(), fc.nat(), fc.string({ maxLength: 4 }), fc.constantFrom('cut', 'splice', 'replace'))
      .map(([i, a, b, ins, how]) => {
        const t = texts[i], p = a % t.length, q = Math.min(t.length, p + (b % 20));
        return how === 'cut' ? t.slice(0, p) : how === 'splice' ? t.slice(0, p) + ins + t.slice(p) : t.slice(0, p) + ins + t.slice(q);
      });
    fc.assert(fc.property(damaged, (t) => { tally('damaged text'); checkParse(parseSetupText(t)); }), { numRuns: 6_000 });
  });

  it('huge and deep documents, fixed cases', () => {
    const base = EXAMPLES[0].doc as Record<string, Record<string, unknown>>;
    let deep: unknown = 1;
    for (let i = 0; i < 200_000; i++) deep = i % 2 ? [deep] : { a: deep };
    const cases: unknown[] = [
      { ...base, ring: { ...base.ring, circumference: deep } },
      { ...base, extra: deep },
      { ...base, rf: { systems: Array.from({ length: 1_000_000 }, () => ({ harmonic: 'x', voltage: 1 })) } },
      { ...base, energy: { start: base.energy.start, ramp: { kind: 'table', quantity: 'momentum', points: Array.from({ length: 100_000 }, (_, i) => [i + 1, 'a']) } } },
      { ...base, title: 'x'.repeat(1_000_000) },
    ];
    for (const c of cases) {
      tally('huge or deep');
      const r = parseSetup(c);
      expect(r.ok).toBe(false);
      checkParse(r);
    }
    tally('huge or deep');
    checkParse(parseSetupText('['.repeat(500_000) + ']'.repeat(500_000)));
  });
});
