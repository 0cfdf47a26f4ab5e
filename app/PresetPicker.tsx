// Preset menu: the invented example machines, each labelled fictional in its title.
import { PRESETS } from './presets.ts';
import { loadSetup, useApp } from './store.ts';

/** Loads a preset (the beam is regenerated). */
export function PresetPicker() {
  const valid = useApp((s) => s.valid);
  const current = PRESETS.find((p) => p.setup === valid)?.id ?? '';
  return (
    <label className="preset">
      <span>Preset</span>
      <select
        id="preset"
        value={current}
        onChange={(e) => {
          const p = PRESETS.find((q) => q.id === e.target.value);
          if (p) loadSetup(p.setup);
        }}
      >
        <option value="" disabled>
          (edited setup)
        </option>
        {PRESETS.map((p) => (
          <option key={p.id} value={p.id}>
            {p.title}
          </option>
        ))}
      </select>
    </label>
  );
}
