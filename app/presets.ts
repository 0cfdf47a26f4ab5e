// Presets: the example setup files (invented machines), bundled at build time from examples/*.json.
// The command line reads the same files, so a preset and its file never drift apart.
import { parseSetup } from '../core/setup/validate.ts';
import type { Setup } from '../core/setup/schema.ts';

/** One example machine. */
export interface Preset {
  id: string;
  title: string;
  setup: Setup;
}

const files = import.meta.glob('../examples/*.json', { eager: true, import: 'default' }) as Record<string, unknown>;

// The demo machine opens first; the rest follow in file-name order.
const DEFAULT_ID = 'alder-booster';

/** All presets that validate, the default first. */
export const PRESETS: Preset[] = Object.entries(files)
  .map(([path, doc]) => {
    const id = path.replace(/^.*\//, '').replace(/\.json$/, '');
    const r = parseSetup(doc);
    return r.ok ? { id, title: r.setup.title || id, setup: r.setup } : null;
  })
  .filter((p): p is Preset => p !== null)
  .sort((a, b) => (a.id === DEFAULT_ID ? -1 : b.id === DEFAULT_ID ? 1 : a.id.localeCompare(b.id)));

/** The setup the app opens with. */
export function defaultPreset(): Preset {
  return PRESETS[0];
}
