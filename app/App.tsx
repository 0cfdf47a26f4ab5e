// The page: header (presets, run controls, files), notice bar, setup editor | phase space and line density |
// bucket numbers, evolution and profile history; the caution line is always at the bottom.
import { useEffect } from 'react';
import { SetupEditor } from './editor/SetupEditor.tsx';
import { FileActions } from './FileActions.tsx';
import { NoticeBar } from './Notice.tsx';
import { PresetPicker } from './PresetPicker.tsx';
import { RunControls } from './RunControls.tsx';
import { pause, play } from './runner.ts';
import { useApp } from './store.ts';
import { Evolution } from './views/Evolution.tsx';
import { PhaseSpace } from './views/PhaseSpace.tsx';
import { Profile } from './views/Profile.tsx';
import { Summary } from './views/Summary.tsx';
import { Waterfall } from './views/Waterfall.tsx';

/** The caution shown on every screen. */
export const CAUTION =
  'Results are for design exploration only. Machine protection and radiation safety follow local regulations and licensed practice.';

// Space toggles run/pause unless a control that uses the key has focus.
function useSpaceToRun() {
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.code !== 'Space' || e.repeat || e.ctrlKey || e.metaKey || e.altKey) return;
      const t = e.target as HTMLElement;
      if (t.closest('input, select, textarea, button, summary, [contenteditable]')) return;
      e.preventDefault();
      if (!useApp.getState().frame) return;
      if (useApp.getState().running) pause();
      else play();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);
}

/** The application shell. */
export function App() {
  useSpaceToRun();
  const title = useApp((s) => s.valid.title);
  const fictional = /fictional/i.test(title);
  return (
    <div className="app">
      <header className="topbar">
        <h1>Phasewell</h1>
        <PresetPicker />
        <span className="setup-title" id="setup-title" title={title}>
          {title || 'untitled setup'}
        </span>
        {fictional ? (
          <span className="badge" id="fictional-badge" title="An invented machine for demonstration, not a real accelerator">
            fictional machine
          </span>
        ) : null}
        <FileActions />
      </header>
      <RunControls />
      <NoticeBar />
      <main className="workspace">
        <aside className="editor-col">
          <SetupEditor />
        </aside>
        <div className="center-col">
          <PhaseSpace />
          <Profile />
        </div>
        <div className="right-col">
          <Summary />
          <Evolution />
          <Waterfall />
        </div>
      </main>
      <footer className="caution" id="caution">
        {CAUTION} Presets describe invented (fictional) machines.
      </footer>
    </div>
  );
}
