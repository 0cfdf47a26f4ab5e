// Run controls: run/pause (space), step N turns, turns per frame, reset the beam; the current turn and the
// cycle time are always visible.
import { pause, play, step } from './runner.ts';
import { resetBeam, useApp } from './store.ts';
import { fmtTime } from './units.ts';

const MAX_STEP = 1_000_000;
const MAX_PER_FRAME = 10_000;

function clampInt(text: string, lo: number, hi: number, dflt: number): number {
  const v = Math.round(Number(text));
  return Number.isFinite(v) ? Math.min(hi, Math.max(lo, v)) : dflt;
}

/** The run bar. */
export function RunControls() {
  const running = useApp((s) => s.running);
  const turn = useApp((s) => s.frame?.turn ?? 0);
  const time = useApp((s) => s.frame?.time ?? 0);
  const stepTurns = useApp((s) => s.stepTurns);
  const tpf = useApp((s) => s.turnsPerFrame);
  const status = useApp((s) => s.status);
  const message = useApp((s) => s.statusMessage);
  const hasBeam = useApp((s) => s.frame !== null);
  return (
    <div className="run-controls" role="group" aria-label="Run controls">
      <button type="button" id="run" className="primary" disabled={!hasBeam} onClick={() => (running ? pause() : play())} title="Run or pause (space)">
        {running ? 'Pause' : 'Run'}
      </button>
      <button type="button" id="step" disabled={!hasBeam || running} onClick={() => step(stepTurns)} title="Track this many turns, then stop">
        Step
      </button>
      <label className="inline">
        <input
          id="step-n"
          type="number"
          min={1}
          max={MAX_STEP}
          value={stepTurns}
          onChange={(e) => useApp.setState({ stepTurns: clampInt(e.target.value, 1, MAX_STEP, 100) })}
        />
        turns
      </label>
      <label className="inline" title="Upper limit of turns tracked between two screen updates">
        <input id="tpf" type="number" min={1} max={MAX_PER_FRAME} value={tpf} onChange={(e) => useApp.setState({ turnsPerFrame: clampInt(e.target.value, 1, MAX_PER_FRAME, 20) })} />
        turns/frame
      </label>
      <button type="button" id="reset" onClick={resetBeam} title="Generate the beam again from the setup (turn 0)">
        Reset beam
      </button>
      <span className="counter">
        turn <b id="turn">{turn}</b>
      </span>
      <span className="counter">
        cycle time <b id="cycle-time">{fmtTime(time)}</b>
      </span>
      <span className={'status ' + status} id="status" role="status">
        {message}
      </span>
    </div>
  );
}
