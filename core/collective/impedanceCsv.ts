// CSV import of an impedance table Z(f): a header naming three columns with their units, then one row per frequency.
// Header: `frequency_<Hz|kHz|MHz|GHz>,re_<Ohm|kOhm|MOhm>,im_<Ohm|kOhm|MOhm>`, e.g. `frequency_GHz,re_Ohm,im_Ohm`.
// Units converted at input to Hz and Ω. Convention of the file: 'engineering' (e^{+jωt}, Im Z > 0 inductive, the
// code's own) or 'physics' (e^{−iωt}: Im Z changes sign, PHYSICS.md §12), chosen by the caller.
// Never throws: returns the setup's table block or every problem with its 1-based line number.
import Papa from 'papaparse';

/** The setup's `impedances[]` entry of kind "table". */
export interface ImpedanceTableSetup {
  kind: 'table';
  label: string;
  frequency: number[];
  re: number[];
  im: number[];
}

/** One problem with its 1-based line (0: the file as a whole). */
export interface ImpedanceCsvIssue {
  line: number;
  message: string;
}

export type ImpedanceCsvResult = { ok: true; table: ImpedanceTableSetup } | { ok: false; errors: ImpedanceCsvIssue[] };

// SI prefixes (common practice).
const FREQ: Record<string, number> = { Hz: 1, kHz: 1e3, MHz: 1e6, GHz: 1e9 };
const OHM: Record<string, number> = { Ohm: 1, kOhm: 1e3, MOhm: 1e6 };
const MAX_ROWS = 100_000;

/** Parse CSV text into an impedance table in Hz and Ω (engineering convention). */
export function importImpedanceCsv(text: string, convention: 'engineering' | 'physics', label = ''): ImpedanceCsvResult {
  const rows = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy', comments: '#' }).data;
  const lines = lineNumbers(text);
  if (rows.length < 3) return fail(0, 'expected a header such as "frequency_GHz,re_Ohm,im_Ohm" and at least two rows');
  if (rows.length - 1 > MAX_ROWS) return fail(0, `${rows.length - 1} rows: at most ${MAX_ROWS}`);
  const h = rows[0].map((c) => c.trim());
  const m = [/^frequency_(\w+)$/.exec(h[0] ?? ''), /^re_(\w+)$/.exec(h[1] ?? ''), /^im_(\w+)$/.exec(h[2] ?? '')];
  if (h.length !== 3 || !m[0] || !m[1] || !m[2] || !(m[0][1] in FREQ) || !(m[1][1] in OHM) || !(m[2][1] in OHM))
    return fail(lines[0], `header "${h.join(',')}": expected frequency_<Hz|kHz|MHz|GHz>,re_<Ohm|kOhm|MOhm>,im_<Ohm|kOhm|MOhm>`);
  const fs = FREQ[m[0][1]], rs = OHM[m[1][1]], is = (convention === 'physics' ? -1 : 1) * OHM[m[2][1]];
  const errors: ImpedanceCsvIssue[] = [];
  const table: ImpedanceTableSetup = { kind: 'table', label, frequency: [], re: [], im: [] };
  for (let r = 1; r < rows.length; r++) {
    const c = rows[r];
    if (c.length !== 3) {
      errors.push({ line: lines[r], message: `expected 3 columns (frequency, re, im), found ${c.length}` });
      continue;
    }
    const v = c.map((x) => (x.trim() === '' ? NaN : Number(x.trim())));
    const bad = v.findIndex((x) => !Number.isFinite(x));
    if (bad >= 0) {
      errors.push({ line: lines[r], message: `${['frequency', 're', 'im'][bad]} "${c[bad]}" is not a number` });
      continue;
    }
    const f = v[0] * fs;
    const prev = table.frequency.length ? table.frequency[table.frequency.length - 1] : -1;
    if (!(f > prev && f >= 0)) {
      errors.push({ line: lines[r], message: `frequency ${c[0]} ${m[0][1]} must be ≥ 0 and above the row before` });
      continue;
    }
    table.frequency.push(f);
    table.re.push(v[1] * rs);
    table.im.push(v[2] * is);
  }
  return errors.length ? { ok: false, errors } : { ok: true, table };
}

function fail(line: number, message: string): ImpedanceCsvResult {
  return { ok: false, errors: [{ line, message }] };
}

// 1-based line number of each non-empty, non-comment row (Papa drops those), for messages.
function lineNumbers(text: string): number[] {
  const out: number[] = [];
  text.split(/\r\n|\n|\r/).forEach((l, i) => {
    const t = l.trim();
    if (t !== '' && !t.startsWith('#')) out.push(i + 1);
  });
  return out;
}
