// CSV import of a program: a header naming each column with its unit, then one [time, value] row per line.
// Units converted at input to the code's units: time in s; energies and p·c in eV; field in T; voltage in V;
// phase in deg. Header examples: `time_s,momentum_GeV`, `time_ms,voltage_kV`, `time_s,phase_deg`.
// Never throws: returns the program or every problem with its line number, so the caller keeps what it has.
import Papa from 'papaparse';
import type { MomentumQuantity } from './quantity.ts';
import { tableProblem, type ProgramPoint } from './table.ts';

/** What a CSV column can hold: a momentum-program quantity, or an RF voltage or phase. */
export type CsvQuantity = MomentumQuantity | 'voltage' | 'phase';

/** A program read from CSV, in code units; `start` is the value of a row at t = 0 (null if none). */
export interface CsvProgram {
  quantity: CsvQuantity;
  start: number | null;
  points: [number, number][];
}

/** One problem, with its 1-based line number in the file (0: the file as a whole). */
export interface CsvIssue {
  line: number;
  message: string;
}

export type CsvResult = { ok: true; program: CsvProgram } | { ok: false; errors: CsvIssue[] };

// Unit factors to code units (SI prefixes, common practice).
const TIME_UNITS: Record<string, number> = { s: 1, ms: 1e-3, us: 1e-6 };
const ENERGY_UNITS: Record<string, number> = { eV: 1, keV: 1e3, MeV: 1e6, GeV: 1e9 };
const UNITS: Record<CsvQuantity, Record<string, number>> = {
  momentum: ENERGY_UNITS, kinetic: ENERGY_UNITS, total: ENERGY_UNITS, kineticPerNucleon: ENERGY_UNITS,
  field: { T: 1, mT: 1e-3 },
  voltage: { V: 1, kV: 1e3, MV: 1e6 },
  phase: { deg: 1 },
};
// Allowed values in code units, as in the setup schema (core/setup/programs.ts).
const RANGE: Record<CsvQuantity, [number, number]> = {
  momentum: [0, 1e14], kinetic: [0, 1e14], total: [0, 1e14], kineticPerNucleon: [0, 1e14], field: [0, 1e14],
  voltage: [0, 1e9], phase: [-360, 360],
};
const MAX_ROWS = 100_000;

/** Parse CSV text into a program; `expect` limits the quantities accepted (e.g. only 'voltage' for an RF column). */
export function importProgramCsv(text: string, expect?: readonly CsvQuantity[]): CsvResult {
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy', comments: '#' });
  const rows = parsed.data;
  if (rows.length === 0)
    return fail(0, 'the file is empty: expected a header such as "time_s,momentum_GeV" and at least one row');
  const lineOf = lineNumbers(text);
  const head = header(rows[0], lineOf[0], expect);
  if (!head.ok) return { ok: false, errors: [head.error] };
  if (rows.length === 1) return fail(lineOf[0], 'the header has no data rows below it');
  if (rows.length - 1 > MAX_ROWS) return fail(0, `${rows.length - 1} rows: at most ${MAX_ROWS}`);
  const { quantity, tScale, vScale } = head;
  const [lo, hi] = RANGE[quantity];
  const errors: CsvIssue[] = [];
  const all: [number, number][] = [];
  for (let r = 1; r < rows.length; r++) {
    const line = lineOf[r];
    const cells = rows[r];
    if (cells.length !== 2) { errors.push({ line, message: `expected 2 columns (time, ${quantity}), found ${cells.length}` }); continue; }
    const t = Number(cells[0].trim()) * tScale;
    const v = Number(cells[1].trim()) * vScale;
    if (cells[0].trim() === '' || !Number.isFinite(t)) { errors.push({ line, message: `time "${cells[0]}" is not a number` }); continue; }
    if (cells[1].trim() === '' || !Number.isFinite(v)) { errors.push({ line, message: `${quantity} "${cells[1]}" is not a number` }); continue; }
    if (t < 0) { errors.push({ line, message: `time ${cells[0]} must be ≥ 0` }); continue; }
    if (v < lo || v > hi) { errors.push({ line, message: `${quantity} ${cells[1]} ${head.unit} is outside [${lo / vScale}, ${hi / vScale}] ${head.unit}` }); continue; }
    const prev = all.length ? all[all.length - 1][0] : -Infinity;
    if (t < prev) { errors.push({ line, message: `time ${cells[0]} is earlier than the row before; times must not decrease` }); continue; }
    all.push([t, v]);
  }
  if (errors.length) return { ok: false, errors };
  const start = all[0][0] === 0 ? all[0][1] : null;
  const points = start === null ? all : all.slice(1);
  if (points.length === 0) return fail(lineOf[1], 'only a row at t = 0: a program needs at least one later point');
  const problem = tableProblem(points as ProgramPoint[]);
  if (problem) return fail(0, problem);
  return { ok: true, program: { quantity, start, points } };
}

/** One line per issue: "line N: message". */
export function formatCsvIssue(i: CsvIssue): string {
  return i.line > 0 ? `line ${i.line}: ${i.message}` : i.message;
}

type Header = { ok: true; quantity: CsvQuantity; unit: string; tScale: number; vScale: number } | { ok: false; error: CsvIssue };

function header(cells: string[], line: number, expect?: readonly CsvQuantity[]): Header {
  const bad = (message: string): Header => ({ ok: false, error: { line, message } });
  if (cells.length !== 2) return bad(`the header must name 2 columns, "time_<unit>,<quantity>_<unit>", found ${cells.length}`);
  const [tName, tUnit] = split(cells[0]);
  if (tName !== 'time') return bad(`first column "${cells[0].trim()}": must be time_s, time_ms or time_us`);
  if (!(tUnit in TIME_UNITS)) return bad(`time unit "${tUnit}": must be one of ${Object.keys(TIME_UNITS).join(', ')}`);
  const [q, unit] = split(cells[1]);
  const allowed = expect ?? (Object.keys(UNITS) as CsvQuantity[]);
  if (!(allowed as readonly string[]).includes(q)) return bad(`second column "${cells[1].trim()}": the quantity must be one of ${allowed.join(', ')}`);
  const units = UNITS[q as CsvQuantity];
  if (!(unit in units)) return bad(`unit "${unit}" of ${q}: must be one of ${Object.keys(units).join(', ')}`);
  return { ok: true, quantity: q as CsvQuantity, unit, tScale: TIME_UNITS[tUnit], vScale: units[unit] };
}

// "momentum_GeV" → ["momentum", "GeV"]; the unit follows the last underscore.
function split(cell: string): [string, string] {
  const c = cell.trim();
  const k = c.lastIndexOf('_');
  return k < 0 ? [c, ''] : [c.slice(0, k), c.slice(k + 1)];
}

// 1-based file line of each non-empty, non-comment row, in the order Papa returns them.
function lineNumbers(text: string): number[] {
  const out: number[] = [];
  const lines = text.split(/\r\n|\n|\r/);
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i].trim();
    if (l !== '' && !l.startsWith('#') && l.replace(/,/g, '').trim() !== '') out.push(i + 1);
  }
  return out;
}

function fail(line: number, message: string): CsvResult {
  return { ok: false, errors: [{ line, message }] };
}
