// The setup editor: groups in the order the trade thinks (ring and particle, RF, energy program, beam, run),
// with the list of problems of the draft on top. The last valid setup keeps running while any are listed.
import { formatIssue } from '../../core/setup/validate.ts';
import { useApp } from '../store.ts';
import { BeamSection, RunSection } from './BeamSection.tsx';
import { CollectiveSection } from './CollectiveSection.tsx';
import { ProgramSection } from './ProgramSection.tsx';
import { RfSection } from './RfSection.tsx';
import { EnergySection, RingSection } from './RingSection.tsx';

function Problems() {
  const issues = useApp((s) => s.issues);
  if (!issues.length) return <p className="editor-ok" id="editor-state">Setup valid: it is the one running.</p>;
  return (
    <div className="editor-problems" id="editor-state" role="alert">
      <strong>{issues.length === 1 ? '1 problem' : `${issues.length} problems`}: the last valid setup keeps running.</strong>
      <ul>
        {issues.map((i, k) => (
          <li key={k}>{formatIssue(i)}</li>
        ))}
      </ul>
    </div>
  );
}

/** The whole editor column. */
export function SetupEditor() {
  return (
    <form className="editor" aria-label="Setup" onSubmit={(e) => e.preventDefault()} autoComplete="off">
      <h2>Setup</h2>
      <Problems />
      <RingSection />
      <RfSection />
      <EnergySection />
      <ProgramSection />
      <BeamSection />
      <CollectiveSection />
      <RunSection />
    </form>
  );
}
