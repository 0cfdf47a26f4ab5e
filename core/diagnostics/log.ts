// A growing columnar record of TurnDiagnostics (one Float64Array per field) with CSV export.
// Units as in TurnDiagnostics: s, eV, eV·s; the CSV header carries them.
import type { TurnDiagnostics } from './moments.ts';

// Field order and CSV column names with units.
const FIELDS: readonly [keyof TurnDiagnostics, string][] = [
  ['turn', 'turn'], ['time', 'time_s'], ['alive', 'alive'], ['lost', 'lost'],
  ['meanDt', 'meanDt_s'], ['meanDE', 'meanDE_eV'], ['rmsDt', 'rmsDt_s'], ['rmsDE', 'rmsDE_eV'],
  ['emittanceRms', 'emittanceRms_eVs'], ['emittance90', 'emittance90_eVs'], ['emittance95', 'emittance95_eVs'],
  ['length4Sigma', 'length4Sigma_s'], ['lengthFwhm', 'lengthFwhm_s'], ['insideFraction', 'insideFraction'],
];

/** Diagnostics turn by turn, stored as columns. */
export class DiagnosticsLog {
  private cols = new Map<keyof TurnDiagnostics, Float64Array>();
  private count = 0;

  constructor() {
    for (const [k] of FIELDS) this.cols.set(k, new Float64Array(64));
  }

  /** Append one record (columns double in size when full). */
  push(d: TurnDiagnostics): void {
    for (const [k] of FIELDS) {
      let c = this.cols.get(k)!;
      if (this.count === c.length) {
        const g = new Float64Array(2 * c.length);
        g.set(c);
        this.cols.set(k, (c = g));
      }
      c[this.count] = d[k];
    }
    this.count++;
  }

  /** Number of records. */
  get length(): number {
    return this.count;
  }

  /** A copy of one column, length `length`. */
  column(name: keyof TurnDiagnostics): Float64Array {
    const c = this.cols.get(name);
    if (!c) throw new Error(`unknown diagnostics column: ${String(name)}`);
    return c.slice(0, this.count);
  }

  /** CSV text: a header with units (e.g. "turn,time_s,...") and one line per record. */
  toCsv(): string {
    const lines = [FIELDS.map(([, h]) => h).join(',')];
    for (let i = 0; i < this.count; i++) lines.push(FIELDS.map(([k]) => String(this.cols.get(k)![i])).join(','));
    return lines.join('\n') + '\n';
  }
}
