// Bring older setup documents to the current version instead of rejecting them.
// Version 0 was the pre-release draft: RF voltages in kV ("voltage_kV") and the run block called "tracking".
import { SETUP_VERSION } from './schema.ts';

type Doc = Record<string, unknown>;
type Migration = (d: Doc) => Doc;

const MIGRATIONS: Record<number, Migration> = {
  0: (d) => {
    const rf = (d.rf ?? {}) as Doc;
    const systems = Array.isArray(rf.systems)
      ? rf.systems.map((s: Doc) => {
          const { voltage_kV, ...rest } = s ?? {};
          return typeof voltage_kV === 'number' ? { ...rest, voltage: voltage_kV * 1e3 } : s;
        })
      : rf.systems;
    const { tracking, ...rest } = d;
    return { ...rest, rf: { ...rf, systems }, ...(tracking !== undefined ? { run: tracking } : {}), version: 1 };
  },
};

export type MigrateResult =
  | { ok: true; doc: unknown; from?: number }
  | { ok: false; error: { path: string; value: unknown; message: string } };

/** Apply migrations from the document's version up to SETUP_VERSION. */
export function migrate(input: unknown): MigrateResult {
  if (input === null || typeof input !== 'object' || Array.isArray(input))
    return { ok: false, error: { path: '', value: input, message: 'a setup must be a JSON object' } };
  let d = input as Doc;
  const v = d.version;
  if (v === SETUP_VERSION) return { ok: true, doc: d };
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 0 || v > SETUP_VERSION)
    return { ok: false, error: { path: 'version', value: v, message: `must be an integer in [0, ${SETUP_VERSION}]` } };
  for (let k = v; k < SETUP_VERSION; k++) d = MIGRATIONS[k](d);
  return { ok: true, doc: d, from: v };
}
