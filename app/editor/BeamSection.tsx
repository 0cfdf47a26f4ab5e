// Editor groups "Beam" (distribution, size, macroparticles, offsets, seed) and "Run" (drift model, aperture,
// turns, diagnostics). A change here regenerates the beam; other groups apply to the running beam.
import { editField, MAX_BROWSER_PARTICLES, MEMORY_BUDGET, runBytes, useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { NumberField, SelectField } from './Field.tsx';
import { Section } from './Section.tsx';

const KINDS: [string, string][] = [['matched', 'matched to the bucket'], ['unmatched', 'unmatched ellipse'], ['coasting', 'coasting (unbunched)']];
const SHAPES: [string, string][] = [['gaussian', 'gaussian'], ['parabolic', 'parabolic'], ['flat', 'flat (waterbag)']];
const SIZE_BY: [string, string][] = [['emittance', 'longitudinal emittance'], ['rmsLength', 'rms bunch length']];
const CONVENTIONS: [string, string][] = [['contour', 'limiting contour area'], ['fourSigma', '4π σt σE'], ['rms', 'rms (no π)']];
const DRIFTS: [string, string][] = [['exact', 'exact time of flight'], ['linear', 'linear in δ (η0 only)']];
const D = ['beam', 'distribution'] as const;

function newDistribution(kind: string): unknown {
  if (kind === 'matched') return { kind, shape: 'parabolic', size: { by: 'emittance', convention: 'contour', value: 0.3 } };
  if (kind === 'unmatched') return { kind, shape: 'gaussian', rmsLength: 20e-9, mismatch: 1 };
  return { kind, rmsEnergySpread: 100e3 };
}

const MB = 2 ** 20;

/** The browser memory a run with the typed macroparticle count will take, shown before it starts. */
function MemoryEstimate() {
  const n = useApp((s) => getIn(s.draft, ['beam', 'particles']));
  if (typeof n !== 'number' || !(n >= 1)) return null;
  const over = runBytes(n) > MEMORY_BUDGET;
  return (
    <p className={'field-note' + (over ? ' over' : '')} id="memory-estimate" data-bytes={runBytes(n)} title={`at most ${MAX_BROWSER_PARTICLES} macroparticles in the browser`}>
      about {(runBytes(n) / MB).toPrecision(3)} MB in the browser (budget {MEMORY_BUDGET / MB} MB)
    </p>
  );
}

/** Beam distribution and macroparticles. */
export function BeamSection() {
  const kind = String(useApp((s) => getIn(s.draft, [...D, 'kind'])));
  const by = String(useApp((s) => getIn(s.draft, [...D, 'size', 'by'])));
  return (
    <Section title="Beam" id="beam">
      <SelectField path={[...D, 'kind']} label="Distribution" options={KINDS} onPick={(k) => editField([...D], newDistribution(k))} />
      {kind !== 'coasting' ? (
        <SelectField path={[...D, 'shape']} label="Shape" options={kind === 'matched' ? SHAPES : SHAPES.slice(0, 2)} />
      ) : null}
      {kind === 'matched' ? (
        <>
          <SelectField
            path={[...D, 'size', 'by']}
            label="Size given by"
            options={SIZE_BY}
            onPick={(b) => editField([...D, 'size'], b === 'rmsLength' ? { by: b, value: 20e-9 } : { by: b, convention: 'contour', value: 0.3 })}
          />
          {by === 'emittance' ? (
            <>
              <SelectField path={[...D, 'size', 'convention']} label="Emittance convention" options={CONVENTIONS} />
              <NumberField path={[...D, 'size', 'value']} label="Emittance" unit="eV·s" />
            </>
          ) : (
            <NumberField path={[...D, 'size', 'value']} label="Rms bunch length" unit="ns" toDisplay={1e9} />
          )}
        </>
      ) : null}
      {kind === 'unmatched' ? (
        <>
          <NumberField path={[...D, 'rmsLength']} label="Rms bunch length" unit="ns" toDisplay={1e9} />
          <NumberField path={[...D, 'mismatch']} label="Energy-spread mismatch" unit="× matched" />
        </>
      ) : null}
      {kind === 'coasting' ? <NumberField path={[...D, 'rmsEnergySpread']} label="Rms energy spread" unit="keV" toDisplay={1e-3} /> : null}
      <NumberField path={['beam', 'particles']} label="Macroparticles" />
      <MemoryEstimate />
      <NumberField path={['beam', 'seed']} label="Random seed" />
      <NumberField path={['beam', 'timeOffset']} label="Time offset (late +)" unit="ns" toDisplay={1e9} />
      <NumberField path={['beam', 'energyOffset']} label="Energy offset" unit="MeV" toDisplay={1e-6} />
    </Section>
  );
}

/** Tracking settings. */
export function RunSection() {
  return (
    <Section title="Run" id="run">
      <NumberField path={['run', 'turns']} label="Turns to track" />
      <SelectField path={['run', 'drift']} label="Drift" options={DRIFTS} />
      <NumberField path={['run', 'momentumAperture']} label="Momentum aperture |Δp/p|" />
      <NumberField path={['run', 'diagnosticsEvery']} label="Record every" unit="turns" />
      <NumberField path={['run', 'profileBins']} label="Profile bins" />
    </Section>
  );
}
