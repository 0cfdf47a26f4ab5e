// The page: header (presets, run controls, files), notice bar, setup editor | phase space and line density |
// tabs: bucket numbers, evolution and profile history | the cycle | intensity; the caution line is always at the bottom.
import { useEffect, useState } from 'react';
import { startAnalysis } from './cycle/analysis.ts';
import { CycleView } from './cycle/CycleView.tsx';
import { IntensityView } from './intensity/IntensityView.tsx';
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

const TABS = [['beam', 'Beam'], ['cycle', 'Cycle'], ['intensity', 'Intensity']] as const;
type Tab = (typeof TABS)[number][0];

// The right column's tabs. The beam page stays mounted (hidden at full size when closed: its plots follow the
// tracker and keep a displayed div); the cycle and intensity pages exist only while open, so a closed tab costs
// the page nothing while tracking.
function RightColumn() {
  const [tab, setTab] = useState<Tab>('beam');
  const page = (id: Tab) => 'tab-page' + (tab === id ? '' : ' closed');
  return (
    <div className="right-col">
      <div className="tabs" role="tablist" aria-label="Views">
        {TABS.map(([id, label]) => (
          <button key={id} type="button" role="tab" id={'tab-' + id} aria-selected={tab === id} className={tab === id ? 'tab on' : 'tab'} onClick={() => setTab(id)}>
            {label}
          </button>
        ))}
      </div>
      <div className="tab-pages">
        <div className={page('beam')} aria-hidden={tab !== 'beam'}>
          <Summary />
          <Evolution />
          <Waterfall />
        </div>
        {tab === 'cycle' ? (
          <div className="tab-page">
            <CycleView active />
          </div>
        ) : null}
        {tab === 'intensity' ? (
          <div className="tab-page">
            <IntensityView active />
          </div>
        ) : null}
      </div>
    </div>
  );
}

/** The application shell. */
export function App() {
  useSpaceToRun();
  useEffect(startAnalysis, []);
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
        <RightColumn />
      </main>
      <footer className="caution" id="caution">
        {CAUTION} Presets describe invented (fictional) machines.
      </footer>
    </div>
  );
}
