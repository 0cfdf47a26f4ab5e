// Every way the command line can be given bad input ends with exit code 2 and one line on stderr naming what was
// wrong (no stack trace); warnings go to stderr without failing the run.
import { spawn } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = new URL('..', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'pw-cli-err-'));
const example = JSON.parse(readFileSync(join(root, 'examples/alder-booster.json'), 'utf8'));

function cli(...args: string[]): Promise<{ code: number | null; out: string; err: string }> {
  return new Promise((done) => {
    const p = spawn(join(root, 'node_modules/.bin/tsx'), [join(root, 'cli/main.ts'), ...args]);
    let out = '', err = '';
    p.stdout.on('data', (d) => (out += d));
    p.stderr.on('data', (d) => (err += d));
    p.on('close', (code) => done({ code, out, err }));
  });
}

function file(name: string, content: unknown): string {
  const f = join(dir, name);
  writeFileSync(f, typeof content === 'string' ? content : JSON.stringify(content));
  return f;
}

const edit = (f: (d: typeof example) => void) => { const d = structuredClone(example); f(d); return d; };
const small = edit((d) => { d.beam.particles = 500; d.run.turns = 20; });
mkdirSync(join(dir, 'a-directory'));

// [name, argv, what the one line must say]
const CASES: [string, string[], RegExp][] = [
  ['no command', [], /missing command/],
  ['unknown command', ['frobnicate'], /unknown command "frobnicate"/],
  ['unknown option', ['bucket', file('ok.json', small), '--frob', '3'], /Unknown option '--frob'/],
  ['missing setup path', ['bucket'], /missing <setup\.json>/],
  ['file that does not exist', ['bucket', join(dir, 'nope.json')], /nope\.json: cannot read the file/],
  ['a directory instead of a file', ['track', join(dir, 'a-directory')], /a-directory: cannot read the file/],
  ['empty file', ['bucket', file('empty.json', '')], /not valid JSON/],
  ['truncated JSON', ['bucket', file('cut.json', JSON.stringify(small).slice(0, 50))], /not valid JSON/],
  ['JSON array', ['bucket', file('array.json', [1, 2])], /\(setup\) = \[1,2\]: a setup must be a JSON object/],
  ['JSON null', ['cycle', file('null.json', 'null')], /a setup must be a JSON object/],
  ['version from the future', ['bucket', file('v9.json', { ...small, version: 9 })], /version = 9: must be an integer in \[0, 1\]/],
  ['number as a string', ['bucket', file('str.json', edit((d) => { d.rf.systems[0].voltage = 'NaN'; }))], /rf\.systems\[0\]\.voltage = "NaN": must be a number in \[0, 1e9\] V/],
  ['number out of range', ['track', file('big.json', edit((d) => { d.ring.circumference = 1e300; }))], /ring\.circumference = 1e300: must be in \[1, 100000\] m/],
  ['non-integer harmonic', ['bucket', file('h.json', edit((d) => { d.rf.systems[0].harmonic = 4.5; }))], /harmonic = 4\.5: must be an integer in \[1, 1e6\]/],
  ['too many macroparticles', ['track', file('many.json', edit((d) => { d.beam.particles = 3e7; }))], /beam\.particles = 3e7: must be an integer in \[1, 2e7\]/],
  ['too many turns in the file', ['track', file('turns.json', edit((d) => { d.run.turns = 1e9; }))], /run\.turns = 1e9: must be an integer in \[1, 1e8\]/],
  ['total energy below the rest energy', ['bucket', file('rest.json', edit((d) => { d.energy.start = { quantity: 'total', value: 1e8 }; }))], /energy\.start\.value = 1e8: total energy must exceed the rest energy/],
  ['a falling ramp that stops the particle', ['track', file('stop.json', edit((d) => { d.energy.ramp = { kind: 'gainPerTurn', value: -1e6 }; }))], /energy\.ramp\.value = -1e6: .*brings the proton practically to rest .* after about 199 turns/],
  ['a table program below the rest energy', ['cycle', file('table.json', edit((d) => { d.energy.ramp = { kind: 'table', quantity: 'total', points: [[0.1, 5e8]] }; }))], /energy\.ramp\.points\[0\]\[1\] = 5e8: a total program value that leaves the proton practically at rest .*give more than 9\.38273e8 eV/],
  ['bunches that do not divide h', ['bucket', file('bunches.json', { ...small, intensity: { particlesPerBunch: 1e11, bunches: 3 } })], /intensity\.bunches = 3: must divide the main harmonic number h = 4/],
  ['a matched beam without a bucket', ['track', file('nobucket.json', edit((d) => { d.beam.particles = 500; d.rf.systems[0].voltage = 100; }))], /beam\.distribution\.kind = matched: no bucket: the synchronous particle needs .* eV per turn but the RF gives at most/],
  ['a bunch larger than the bucket', ['track', file('huge.json', edit((d) => { d.beam.particles = 500; d.beam.distribution.size.value = 50; }))], /beam\.distribution\.size\.value = 50 eV·s: the contour emittance exceeds/],
  ['--turns not an integer', ['track', file('ok.json', small), '--turns', 'abc'], /--turns = abc: must be an integer in \[1, 100000000\]/],
  ['--turns = 0', ['track', file('ok.json', small), '--turns=0'], /--turns = 0: must be an integer/],
  ['--every negative', ['track', file('ok.json', small), '--every=-3'], /--every = -3: must be an integer/],
  ['--every followed by a dash', ['track', file('ok.json', small), '--every', '-3'], /Option '--every' argument is ambiguous/],
  ['--turns past a ramp that stops the particle', ['track', file('slow.json', edit((d) => { d.beam.particles = 500; d.run.turns = 100; d.energy.ramp = { kind: 'gainPerTurn', value: -1e6 }; })), '--turns', '500'], /--turns = 500: energy\.ramp\.value = -1e6: .*rest/],
  ['--format unknown', ['cycle', file('ok.json', small), '--format', 'xml'], /--format = xml: must be json or csv/],
  ['--samples too small', ['cycle', file('ok.json', small), '--samples', '1'], /--samples = 1: must be an integer in \[2, 100000\]/],
  ['--filling-limit NaN', ['cycle', file('ok.json', small), '--filling-limit', 'NaN'], /--filling-limit = NaN: must be a number in/],
  ['--adiabatic-limit Infinity', ['cycle', file('ok.json', small), '--adiabatic-limit', 'Infinity'], /--adiabatic-limit = Infinity: must be a number in/],
  ['--out in a missing folder', ['track', file('ok.json', small), '--turns', '2', '--out', join(dir, 'no/such/folder/d.csv')], /no such file or directory/],
  ['--particles under a file', ['track', file('ok.json', small), '--turns', '2', '--particles', join(dir, 'ok.json', 'p.csv')], /not a directory/],
];

describe('command-line failures', () => {
  it(`all ${CASES.length} exit 2 with one line on stderr, no stack trace`, async () => {
    const results: Awaited<ReturnType<typeof cli>>[] = [];
    // Four at a time: each starts a tsx process.
    for (let i = 0; i < CASES.length; i += 4) results.push(...(await Promise.all(CASES.slice(i, i + 4).map(([, argv]) => cli(...argv)))));
    CASES.forEach(([name, , want], i) => {
      const r = results[i];
      const lines = r.err.trim().split('\n');
      expect({ name, code: r.code }).toEqual({ name, code: 2 });
      expect(lines, `${name}: ${r.err}`).toHaveLength(1);
      expect(lines[0], name).toMatch(/^phasewell: /);
      expect(lines[0], name).toMatch(want);
      expect(r.err, name).not.toMatch(/\n\s+at |\.ts:\d+/);
    });
  }, 120_000);
});

describe('command-line warnings', () => {
  it('a linear drift near transition is a warning on stderr; the run goes on', async () => {
    const d = edit((x) => {
      x.ring.gammaT = 5.5;
      x.energy = { start: { quantity: 'total', value: 5.49 * 938.272e6 }, ramp: { kind: 'flat' } };
      x.rf.systems[0].voltage = 600e3;
      x.beam.particles = 500;
      x.beam.distribution.size.value = 1;
      x.run.drift = 'linear';
    });
    const r = await cli('track', file('near.json', d), '--turns', '5');
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^phasewell: warning: run\.drift = "linear": near transition: \|η0\| = .* use "exact"\n$/);
    expect(r.out.trim().split('\n').map((l) => l.split(',')[0])).toEqual(['turn', '0', '5']); // header, first and last turn
  });

  it('bucket says "no bucket" plainly on stderr and in the report, with exit 0', async () => {
    const r = await cli('bucket', file('nobucket-report.json', edit((d) => { d.rf.systems[0].voltage = 100; })));
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^phasewell: warning: rf\.systems\[0\]\.voltage = 100: no bucket: the synchronous particle needs .* eV per turn but the RF gives at most 100 eV on the rising slope at turn 0/);
    expect(JSON.parse(r.out).noBucket).toMatch(/^no bucket/);
  });
});
