// Radiation and impedance numbers for the summary: U0, damping times, natural spread and length at the shown
// energy (cheap, computed here), and the energy lost to the impedance (from the intensity report, turn 0).
import { radiationInfo, radiationLattice } from '../../core/radiation.ts';
import type { MachineState } from '../../core/machine.ts';
import type { Setup } from '../../core/setup/schema.ts';
import { useApp } from '../store.ts';
import { fmt, fmtEnergy, fmtTime } from '../units.ts';

function Row(props: { id: string; label: string; value: number; text: string; title?: string }) {
  return (
    <>
      <dt title={props.title}>{props.label}</dt>
      <dd id={'sum-' + props.id} data-value={String(props.value)}>{props.text}</dd>
    </>
  );
}

// Radiation numbers, or the reason they cannot be computed (a missing bending radius).
function radiation(setup: Setup, m: MachineState) {
  try {
    const lat = radiationLattice(setup);
    return lat ? radiationInfo(m, lat) : null;
  } catch {
    return null;
  }
}

/** Extra summary rows for a setup with radiation or intensity; nothing otherwise. */
export function CollectiveNumbers(props: { setup: Setup; m: MachineState }) {
  const st = useApp((s) => s.intensity);
  const r = radiation(props.setup, props.m);
  const rep = st.reportFor === props.setup ? st.report : null;
  if (!r && !rep) return null;
  return (
    <div className="summary-cols collective-numbers">
      {r ? (
        <dl>
          <Row id="u0" label="radiation loss U0" value={r.U0} text={`${fmtEnergy(r.U0)}/turn`} />
          <Row id="tau-e" label="damping time (amplitude)" value={r.tauE} text={`${fmtTime(r.tauE)} (${fmt(r.tauETurns)} turns)`} />
          <Row id="tau-em" label="damping time (emittance)" value={r.tauEmittance} text={fmtTime(r.tauEmittance)} title="σE² and the emittance damp with τE/2" />
          <Row id="sigma-e" label="natural spread σE" value={r.sigmaE} text={`${fmtEnergy(r.sigmaE)} (δ ${fmt(r.sigmaDelta)})`} />
          <Row id="sigma-t" label="natural rms length" value={r.sigmaT} text={fmtTime(r.sigmaT)} title="linear RF, no intensity" />
        </dl>
      ) : <dl />}
      {rep ? (
        <dl>
          <Row id="loss-factor" label="loss factor k" value={rep.lossFactor} text={`${fmt(rep.lossFactor * 1e-12)} V/pC`} title="turn 0, self-consistent bunch" />
          <Row id="loss-turn" label="impedance loss per particle" value={rep.lossPerParticle} text={`${fmtEnergy(rep.lossPerParticle)}/turn`} />
          <Row id="peak-induced" label="peak induced voltage" value={rep.peakInduced} text={`${fmt(rep.peakInduced * 1e-3)} kV`} />
        </dl>
      ) : null}
    </div>
  );
}
