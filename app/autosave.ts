// Autosave: the last valid setup and the draft being edited go to this browser's localStorage a moment after
// each change, so a reload without a link brings them back. An autosave that cannot be read is kept aside
// under a second key (never silently deleted) and the page opens with the default setup and a message.
import type { Setup } from '../core/setup/schema.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';
import { useApp } from './store.ts';

const KEY = 'phasewell.autosave';
/** Where an unreadable autosave is moved, so the user can still recover it by hand. */
export const KEY_UNREADABLE = 'phasewell.autosave.unreadable';
const FORMAT = 1;
const WRITE_DELAY_MS = 400;

/** What was found in localStorage. */
export type Autosaved =
  | { kind: 'none' }
  | { kind: 'ok'; valid: Setup; draft: unknown; savedAt: string }
  | { kind: 'error'; lines: string[] };

function storage(): Storage | null {
  try {
    return window.localStorage; // throws where storage is disabled
  } catch {
    return null;
  }
}

/** Read and check the autosave; an unreadable one is moved aside and reported. */
export function readAutosave(): Autosaved {
  const ls = storage();
  const text = ls?.getItem(KEY) ?? null;
  if (text === null) return { kind: 'none' };
  const lines = problems(text);
  if (lines.length === 0) {
    const d = JSON.parse(text) as { valid: unknown; draft: unknown; savedAt: string };
    const r = parseSetup(d.valid);
    if (r.ok) return { kind: 'ok', valid: r.setup, draft: d.draft ?? r.setup, savedAt: String(d.savedAt) };
  }
  try {
    ls!.setItem(KEY_UNREADABLE, text);
    ls!.removeItem(KEY);
  } catch {
    // Storage full or blocked: leave the item where it is; it is ignored again next time.
  }
  return { kind: 'error', lines };
}

// Why the stored text is not a usable autosave (empty when it is).
function problems(text: string): string[] {
  let d: unknown;
  try {
    d = JSON.parse(text);
  } catch (e) {
    return [`the autosave is not valid JSON (${(e as Error).message.replace(/\s*\n\s*/g, ' ')})`];
  }
  if (d === null || typeof d !== 'object' || (d as { format?: unknown }).format !== FORMAT)
    return [`the autosave is not in format ${FORMAT} (it may come from another version of the app)`];
  const r = parseSetup((d as { valid?: unknown }).valid);
  return r.ok ? [] : r.errors.map((i) => `valid setup: ${formatIssue(i)}`);
}

/** Write the current valid setup and draft now. */
export function saveNow(): void {
  const { valid, draft } = useApp.getState();
  try {
    storage()?.setItem(KEY, JSON.stringify({ format: FORMAT, savedAt: new Date().toISOString(), valid, draft }));
  } catch (e) {
    console.warn('autosave skipped:', (e as Error).message); // quota exceeded or a draft JSON cannot hold
  }
}

/** Save a moment after every change of the valid setup or the draft. */
export function startAutosave(): void {
  let timer = 0;
  useApp.subscribe((s, prev) => {
    if (s.valid === prev.valid && s.draft === prev.draft) return;
    clearTimeout(timer);
    timer = window.setTimeout(saveNow, WRITE_DELAY_MS);
  });
  window.addEventListener('pagehide', saveNow);
}
