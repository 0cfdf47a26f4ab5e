// Keeps the URL fragment equal to the running setup, and opens the setup a link carries. A link that cannot
// be opened says why and falls back to the default setup, so the page always works.
import { KEY_UNREADABLE, readAutosave, startAutosave } from './autosave.ts';
import { decodeFragment, encodeSetup } from './urlCodec.ts';
import { defaultPreset } from './presets.ts';
import { loadSetup, setDraft, useApp } from './store.ts';

// Wait this long after the last edit before rewriting the address bar.
const WRITE_DELAY_MS = 250;

/** Load the setup of the current location's fragment; without one, the autosave of this browser (or the default). */
export function openFromLocation(): void {
  const r = decodeFragment(location.hash);
  if (r.kind === 'none') return restoreAutosave();
  if (r.kind === 'ok') {
    const note = r.migratedFrom !== undefined ? { kind: 'info' as const, title: `This link used setup version ${r.migratedFrom}; it was brought up to date.`, lines: [] } : null;
    loadSetup(r.setup, note);
  } else if (r.kind === 'error') {
    const kept = keepUnreadableLink(location.hash);
    const a = readAutosave(); // the user's last work, rather than the default, when there is one
    const shown = a.kind === 'ok' ? 'the setup autosaved in this browser' : 'the default setup';
    loadSetup(a.kind === 'ok' ? a.valid : defaultPreset().setup, { kind: 'error', title: `The link could not be opened; ${shown} is shown instead${kept}.`, lines: r.lines });
  }
}

/** Where a link that could not be opened is kept (the address bar is then rewritten), so it is not lost. */
export const KEY_UNREADABLE_LINK = 'phasewell.link.unreadable';

function keepUnreadableLink(hash: string): string {
  try {
    localStorage.setItem(KEY_UNREADABLE_LINK, hash);
    return ` (the link is kept in localStorage as "${KEY_UNREADABLE_LINK}")`;
  } catch {
    return '';
  }
}

// The last valid setup and the draft as autosaved; a broken autosave is reported and the default opens.
function restoreAutosave(): void {
  const a = readAutosave();
  if (a.kind === 'ok') {
    loadSetup(a.valid, { kind: 'info', title: `Restored the setup autosaved in this browser at ${new Date(a.savedAt).toLocaleString()}.`, lines: [] });
    if (JSON.stringify(a.draft) !== JSON.stringify(a.valid)) setDraft(a.draft); // unfinished edits come back with their problems
  } else if (a.kind === 'error')
    loadSetup(defaultPreset().setup, {
      kind: 'error',
      title: `The autosaved setup could not be read and was ignored (kept in localStorage as "${KEY_UNREADABLE}"); the default setup is shown.`,
      lines: a.lines,
    });
}

/** Write the fragment whenever the valid setup changes; follow pasted links; autosave to this browser. */
export function startUrlSync(): void {
  startAutosave();
  let timer = 0;
  const write = () => {
    const frag = '#' + encodeSetup(useApp.getState().valid);
    if (frag !== location.hash) history.replaceState(null, '', frag);
  };
  useApp.subscribe((s, prev) => {
    if (s.valid === prev.valid) return;
    clearTimeout(timer);
    timer = window.setTimeout(write, WRITE_DELAY_MS);
  });
  window.addEventListener('hashchange', openFromLocation);
  if (!location.hash || useApp.getState().notice?.kind === 'error') write();
}

/** A link to the running setup (written now, not after the delay). */
export function currentLink(): string {
  return location.href.replace(/#.*$/, '') + '#' + encodeSetup(useApp.getState().valid);
}
