// Sharing and files: copy link, save/load the setup, export particles and diagnostics.
import { useRef, useState } from 'react';
import { baseName, diagnosticsCsv, download, openSetupFile, particlesCsv, setupJson } from './files.ts';
import { fetchParticles } from './runner.ts';
import { setNotice, useApp } from './store.ts';
import { currentLink } from './urlSync.ts';

/** The file and sharing bar. */
export function FileActions() {
  const [link, setLink] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const copy = async () => {
    const url = currentLink();
    setLink(url);
    try {
      await navigator.clipboard.writeText(url);
    } catch {
      // No clipboard permission: the link stays visible and selected for copying by hand.
    }
  };
  const exportParticles = async () => {
    const p = await fetchParticles();
    if (p) download(`${baseName(useApp.getState().valid)}-particles.csv`, particlesCsv(p), 'text/csv');
    else setNotice({ kind: 'info', title: 'The tracker is busy; pause and try again.', lines: [] });
  };
  return (
    <div className="file-actions" role="group" aria-label="Files and sharing">
      <button type="button" id="copy-link" onClick={copy} title="Copy a link that opens this setup">
        Copy link
      </button>
      <button type="button" id="save-setup" onClick={() => { const s = useApp.getState().valid; download(`${baseName(s)}.json`, setupJson(s), 'application/json'); }}>
        Save setup
      </button>
      <button type="button" id="load-setup" onClick={() => fileRef.current?.click()}>
        Load setup…
      </button>
      <input ref={fileRef} id="load-setup-file" type="file" accept=".json,application/json" hidden onChange={(e) => { const f = e.target.files?.[0]; if (f) void openSetupFile(f); e.target.value = ''; }} />
      <button type="button" id="export-particles" onClick={exportParticles}>
        Particles CSV
      </button>
      <button type="button" id="export-diagnostics" onClick={() => { const s = useApp.getState(); download(`${baseName(s.valid)}-diagnostics.csv`, diagnosticsCsv(s.log), 'text/csv'); }}>
        Diagnostics CSV
      </button>
      {link ? (
        <input id="share-link" className="share-link" readOnly value={link} aria-label="Link to this setup" onFocus={(e) => e.target.select()} />
      ) : null}
    </div>
  );
}
