// Property: the link decoder (app/urlCodec.ts) never throws. Any fragment (random text, damaged base64url,
// damaged deflate data, valid links to damaged setups) gives 'none', a valid setup that round-trips through
// encode/decode unchanged, or error lines that each say what was wrong.
import './fcSeed.ts';
import fc from 'fast-check';
import { deflateSync, strToU8 } from 'fflate';
import { afterAll, describe, expect, it } from 'vitest';
import { decodeFragment, encodeSetup, toBase64Url, type LinkResult } from '../app/urlCodec.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { EXAMPLES, mutatedExample } from './property-arbitraries.ts';

const counts: Record<string, number> = {};
const tally = (kind: string) => (counts[kind] = (counts[kind] ?? 0) + 1);
afterAll(() => {
  const total = Object.values(counts).reduce((a, b) => a + b, 0);
  console.log(`property-link: ${total} links (${Object.entries(counts).map(([k, n]) => `${k} ${n}`).join(', ')})`);
});

const LINKS = EXAMPLES.map((e) => '#' + encodeSetup(e.doc));
const B64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';

/** Decode, then check the result's shape; valid setups must survive encode → decode unchanged. */
function check(hash: string): LinkResult {
  const r = decodeFragment(hash);
  if (r.kind === 'ok') {
    const again = decodeFragment('#' + encodeSetup(r.setup));
    if (again.kind !== 'ok') throw new Error(`a decoded setup does not decode again: ${JSON.stringify(again)}`);
    expect(JSON.stringify(again.setup)).toBe(JSON.stringify(r.setup));
    expect(parseSetup(r.setup).ok).toBe(true);
  } else if (r.kind === 'error') {
    if (!(r.lines.length >= 1 && r.lines.length <= 51)) throw new Error(`${r.lines.length} error lines`);
    for (const l of r.lines) if (typeof l !== 'string' || l.trim() === '' || /\n/.test(l) || l.length > 4000) throw new Error(`bad error line: ${String(l).slice(0, 200)}`);
  } else expect(hash === '' || hash === '#').toBe(true);
  return r;
}

describe('decodeFragment on hostile links', () => {
  it('random text after "#", with and without the s1= prefix', () => {
    const text = fc.oneof(fc.string({ maxLength: 200 }), fc.string({ unit: fc.constantFrom(...B64), maxLength: 400 }).map((s) => 's1=' + s), fc.string({ unit: 'binary', maxLength: 60 }));
    fc.assert(fc.property(text, (t) => { tally('random text'); check('#' + t); }), { numRuns: 9_000 });
  });

  it('valid links with characters replaced, inserted or cut', () => {
    const damaged = fc.tuple(fc.nat(LINKS.length - 1), fc.nat(), fc.nat(), fc.constantFrom(...B64.split(''), '=', '+', '/', '%', ' ', 'é'), fc.constantFrom('replace', 'insert', 'cut'))
      .map(([i, a, b, c, how]) => {
        const l = LINKS[i], p = 4 + (a % (l.length - 4));
        return how === 'replace' ? l.slice(0, p) + c + l.slice(p + 1) : how === 'insert' ? l.slice(0, p) + c + l.slice(p) : l.slice(0, p + (b % 3));
      });
    fc.assert(fc.property(damaged, (h) => { tally('damaged base64url'); check(h); }), { numRuns: 8_000 });
  });

  it('deflate data with bits flipped (valid base64url)', () => {
    const packed = EXAMPLES.map((e) => deflateSync(strToU8(JSON.stringify(e.doc))));
    const flipped = fc.tuple(fc.nat(packed.length - 1), fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 7 })), { minLength: 1, maxLength: 4 }))
      .map(([i, flips]) => {
        const b = packed[i].slice();
        for (const [at, bit] of flips) b[at % b.length] ^= 1 << bit;
        return '#s1=' + toBase64Url(b);
      });
    let opened = 0;
    fc.assert(fc.property(flipped, (h) => { tally('flipped deflate bits'); if (check(h).kind === 'ok') opened++; }), { numRuns: 6_000 });
    expect(opened).toBeLessThan(6_000); // most flips must be caught somewhere
  });

  it('well-formed links to mutated setups', () => {
    // Deep nests cannot be written as JSON at all (JSON.stringify overflows), so they never make a link.
    const linkable = mutatedExample.filter(({ kinds }) => !kinds.includes('deep'));
    fc.assert(fc.property(linkable, ({ doc }) => { tally('links to mutated setups'); check('#' + encodeSetup(doc)); }), { numRuns: 2_000 });
  });

  it('fixed cases: other prefixes and versions, a decompression bomb, an over-long fragment', () => {
    const bomb = '#s1=' + toBase64Url(deflateSync(new Uint8Array(50_000_000)));
    const cases: [string, RegExp | null][] = [
      ['', null], ['#', null], ['#s1=', /could not be decompressed|not valid JSON/], ['#s9=' + LINKS[0].slice(4), /newer version/],
      ['#s0=' + LINKS[0].slice(4), null], ['#x=abc', /does not start with/], ['#s1=' + 'A'.repeat(4_100_000), /at most 4000000/],
      [bomb, /expands to more than 16000000 bytes/], ['#s1=' + toBase64Url(deflateSync(strToU8('null'))), /a setup must be a JSON object/],
      ['#s1=' + toBase64Url(deflateSync(strToU8('{"version":1'))), /not valid JSON/],
    ];
    for (const [h, want] of cases) {
      tally('fixed');
      const r = check(h);
      if (want) expect(r.kind === 'error' && r.lines.join(' ')).toMatch(want);
    }
  });

  it('every example link opens and round-trips', () => {
    for (const l of LINKS) {
      tally('example links');
      expect(check(l).kind).toBe('ok');
    }
  });
});
