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

// The right column's tabs. All stay mounted, the closed ones hidden at full size: a plot that loses its div or
// shrinks to nothing cannot be resized by Plotly, and each redraws only when its data change.
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
        <div className={page('cycle')} aria-hidden={tab !== 'cycle'}>
          <CycleView active={tab === 'cycle'} />
        </div>
        <div className={page('intensity')} aria-hidden={tab !== 'intensity'}>
          <IntensityView active={tab === 'intensity'} />
        </div>
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
