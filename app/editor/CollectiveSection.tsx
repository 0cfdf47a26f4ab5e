// Editor group "Intensity and radiation": a summary of the collective and radiation blocks of the setup
// (impedance models and tables are long; they are edited in the setup file). Present only when used.
import { useApp } from '../store.ts';
import { getIn } from '../paths.ts';
import { NumberField } from './Field.tsx';
import { Section } from './Section.tsx';

function impedanceSummary(list: unknown): string {
  if (!Array.isArray(list) || list.length === 0) return 'none';
  const count = new Map<string, number>();
  for (const z of list) {
    const k = String((z as { kind?: unknown })?.kind ?? '?');
    count.set(k, (count.get(k) ?? 0) + 1);
  }
  return [...count].map(([k, n]) => (n > 1 ? `${n} × ${k}` : k)).join(', ');
}

/** Intensity, impedances and radiation, when the setup has them. */
export function CollectiveSection() {
  const intensity = useApp((s) => getIn(s.draft, ['intensity'])) as { particlesPerBunch?: number; averageCurrent?: number } | undefined;
  const impedances = useApp((s) => getIn(s.draft, ['impedances']));
  const radiation = useApp((s) => getIn(s.draft, ['radiation'])) as { damping?: boolean; quantumExcitation?: boolean } | undefined;
  if (!intensity && !radiation && !(Array.isArray(impedances) && impedances.length)) return null;
  return (
    <Section title="Intensity and radiation" id="collective">
      {intensity?.particlesPerBunch !== undefined ? <NumberField path={['intensity', 'particlesPerBunch']} label="Particles per bunch" /> : null}
      {intensity?.averageCurrent !== undefined ? <NumberField path={['intensity', 'averageCurrent']} label="Average current" unit="mA" toDisplay={1e3} /> : null}
      {intensity ? <NumberField path={['intensity', 'bunches']} label="Bunches in the ring" /> : null}
      <p className="field-note">Impedance models: {impedanceSummary(impedances)}.</p>
      {radiation ? (
        <>
          <NumberField path={['radiation', 'partitionE']} label="Damping partition J_E" />
          <p className="field-note">
            Radiation: damping {radiation.damping === false ? 'off' : 'on'}, quantum excitation {radiation.quantumExcitation === false ? 'off' : 'on'}.
          </p>
        </>
      ) : null}
      <p className="field-note">
        The separatrix drawn is that of the RF alone{intensity ? '; the induced voltage of the beam is not included' : ''}. Impedance tables
        and radiation integrals are edited in the setup file.
      </p>
    </Section>
  );
}
