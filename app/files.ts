// Files in and out: the setup as JSON (the same file the command line reads), particles and per-turn
// diagnostics as CSV (headers carry units).
import { DiagnosticsLog } from '../core/diagnostics/index.ts';
import type { Setup } from '../core/setup/schema.ts';
import { formatIssue, parseSetupText } from '../core/setup/validate.ts';
import type { DiagRow } from '../workers/protocol.ts';
import { loadSetup, setNotice } from './store.ts';

/** Offer text as a file download. */
export function download(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** File name from a setup title. */
export function baseName(s: Setup): string {
  return (s.title || 'setup').toLowerCase().replace(/\(.*?\)/g, '').replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'setup';
}

/** The setup as pretty JSON. */
export function setupJson(s: Setup): string {
  return JSON.stringify(s, null, 2) + '\n';
}

/** Read a setup file; a bad file leaves the current setup and says what is wrong. */
export async function openSetupFile(f: File): Promise<void> {
  const r = parseSetupText(await f.text());
  if (r.ok) loadSetup(r.setup, { kind: 'info', title: `Loaded ${f.name}.`, lines: [] });
  else setNotice({ kind: 'error', title: `${f.name} was not loaded; the current setup keeps running.`, lines: r.errors.map(formatIssue) });
}

/** Diagnostics rows as CSV (same columns as the command line's track output). */
export function diagnosticsCsv(rows: DiagRow[]): string {
  const log = new DiagnosticsLog();
  for (const r of rows) log.push(r);
  return log.toCsv();
}

/** Particles as CSV: alive flag, dt [s], dE [eV]. */
export function particlesCsv(p: { dt: Float64Array; dE: Float64Array; alive: number }): string {
  const rows = ['alive,dt_s,dE_eV'];
  for (let i = 0; i < p.dt.length; i++) rows.push(`${i < p.alive ? 1 : 0},${p.dt[i]},${p.dE[i]}`);
  return rows.join('\n') + '\n';
}
