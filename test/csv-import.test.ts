// CSV import of programs: unit headers converted to code units, bad rows reported by line, nothing applied on
// error. Units: time in s, energies in eV, field in T, voltage in V, phase in deg. Unit prefixes are SI (common practice).
import { describe, expect, it } from 'vitest';
import { withMomentumProgram, withRfProgram } from '../core/program/apply.ts';
import { formatCsvIssue, importProgramCsv } from '../core/program/csv.ts';
import { MachineStepper } from '../core/machine.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';
import type { SetupInput } from '../core/setup/schema.ts';

const doc: SetupInput = {
  version: 1,
  title: 'Test ring (fictional)',
  particle: { kind: 'proton' },
  ring: { circumference: 200, gammaT: 6, bendingRadius: 12 },
  energy: { start: { quantity: 'kinetic', value: 400e6 } },
  rf: { systems: [{ harmonic: 5, voltage: 50e3 }] },
  beam: { distribution: { kind: 'coasting', rmsEnergySpread: 1e5 }, particles: 10 },
};

describe('CSV import: good tables', () => {
  it('converts ms and kV, takes the t = 0 row as the start value, skips comments and blank lines', () => {
    const r = importProgramCsv('# voltage for the capture\ntime_ms,voltage_kV\n0,5\n\n1.5,20\n 3 , 40 \n');
    if (!r.ok) throw new Error(r.errors.map(formatCsvIssue).join('; '));
    expect(r.program.quantity).toBe('voltage');
    expect(r.program.start).toBe(5000);
    expect(r.program.points).toEqual([[0.0015, 20000], [0.003, 40000]]);
  });

  it('reads a momentum program in GeV without a t = 0 row (start stays the setup\'s)', () => {
    const r = importProgramCsv('time_s,momentum_GeV\n0.01,1.2\n0.02,2.5\n');
    if (!r.ok) throw new Error(r.errors.map(formatCsvIssue).join('; '));
    expect(r.program).toEqual({ quantity: 'momentum', start: null, points: [[0.01, 1.2e9], [0.02, 2.5e9]] });
  });

  it('applied to a setup in one step, the tracker follows it', () => {
    const r = importProgramCsv('time_s,voltage_V\n0,10000\n0.001,30000\n');
    if (!r.ok) throw new Error('import failed');
    const s = parseSetup(withRfProgram(doc, 0, 'voltage', r.program));
    if (!s.ok) throw new Error(s.errors.map(formatIssue).join('; '));
    const st = new MachineStepper(s.setup);
    expect(st.state.rf[0].V).toBe(10000);
    while (st.state.time < 0.0005) st.advance();
    expect(st.state.rf[0].V).toBeCloseTo(10000 + 20000 * (st.state.time / 0.001), 6);
    // A field table with a t = 0 row sets energy.start to the same momentum: p·c = Z·c·B·ρ (PHYSICS.md §2).
    const f = importProgramCsv('time_s,field_T\n0,0.2\n0.01,0.6\n');
    if (!f.ok) throw new Error('import failed');
    const d = withMomentumProgram(doc, f.program as never);
    expect(d.energy.start).toEqual({ quantity: 'momentum', value: 0.2 * 299792458 * 12 });
    expect(parseSetup(d).ok).toBe(true);
  });
});

describe('CSV import: bad input', () => {
  it('a bad row is reported by its line number, with every other bad row, and nothing is returned to apply', () => {
    const text = 'time_s,voltage_kV\n0,5\n0.001,abc\n# comment\n0.002,7\n0.0015,8\n0.003,-2\n0.004,1,9\n';
    const r = importProgramCsv(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map(formatCsvIssue)).toEqual([
      'line 3: voltage "abc" is not a number',
      'line 6: time 0.0015 is earlier than the row before; times must not decrease',
      'line 7: voltage -2 kV is outside [0, 1000000] kV',
      'line 8: expected 2 columns (time, voltage), found 3',
    ]);
    // The setup the user had is untouched: the import returned no program, so there is nothing to apply.
    expect('program' in r).toBe(false);
  });

  it('an empty file says what is expected', () => {
    for (const text of ['', '\n\n', '# only a comment\n']) {
      const r = importProgramCsv(text);
      expect(!r.ok && formatCsvIssue(r.errors[0])).toMatch(/^the file is empty: expected a header such as "time_s,momentum_GeV"/);
    }
    const h = importProgramCsv('time_s,voltage_V\n');
    expect(!h.ok && formatCsvIssue(h.errors[0])).toBe('line 1: the header has no data rows below it');
  });

  it('a wrong units header names the column, the unit and the allowed ones', () => {
    const msg = (text: string, expect?: Parameters<typeof importProgramCsv>[1]) => {
      const r = importProgramCsv(text, expect);
      return r.ok ? 'ok' : formatCsvIssue(r.errors[0]);
    };
    expect(msg('time_s,voltage_W\n0,1\n')).toBe('line 1: unit "W" of voltage: must be one of V, kV, MV');
    expect(msg('time_min,voltage_V\n0,1\n')).toBe('line 1: time unit "min": must be one of s, ms, us');
    expect(msg('t,voltage_V\n0,1\n')).toMatch(/^line 1: first column "t": must be time_s, time_ms or time_us/);
    expect(msg('time_s,power_W\n0,1\n')).toMatch(/^line 1: second column "power_W": the quantity must be one of momentum, kinetic/);
    expect(msg('time_s,momentum_GeV\n0,1\n1,2\n', ['voltage'])).toBe('line 1: second column "momentum_GeV": the quantity must be one of voltage');
    expect(msg('\n# units below\ntime_s,phase_rad\n0,1\n')).toBe('line 3: unit "rad" of phase: must be one of deg');
  });

  it('a lone t = 0 row is not a program', () => {
    const r = importProgramCsv('time_s,voltage_V\n0,5\n');
    expect(!r.ok && formatCsvIssue(r.errors[0])).toBe('line 2: only a row at t = 0: a program needs at least one later point');
  });
});
