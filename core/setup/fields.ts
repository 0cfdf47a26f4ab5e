// Numeric field helpers for the setup schema: every number carries its unit and allowed range, so that an
// error can name the field, the value and the range (see format.ts), and the docs can list them.
import { z } from 'zod';

// No code generation on a page: zod would otherwise probe `Function('')` when the first object schema is built,
// which the app's Content Security Policy refuses (a reported violation). Set here, the module every schema piece
// imports first. Node keeps it: there the jitless path overflows the stack on ~1e5 bad table points, which
// parseSetup then reports as one issue instead of listing the first 50.
z.config({ jitless: 'document' in globalThis });

export interface FieldInfo {
  unit: string;
  min: number;
  max: number;
  integer: boolean;
  description: string;
}

/** Number in [min, max] with a unit; the message states the range. */
export function num(unit: string, min: number, max: number, description: string) {
  const range = `${fmtRange(min, max)}${unit ? ' ' + unit : ''}`;
  return z
    .number({ error: `must be a number in ${range}` })
    .refine(Number.isFinite, { error: `must be a finite number in ${range}` })
    .refine((v) => v >= min && v <= max, { error: `must be in ${range}` })
    .meta({ unit, min, max, integer: false, description } satisfies FieldInfo);
}

/** Integer in [min, max]. */
export function int(unit: string, min: number, max: number, description: string) {
  const range = `${fmtRange(min, max)}${unit ? ' ' + unit : ''}`;
  return z
    .number({ error: `must be an integer in ${range}` })
    .refine((v) => Number.isInteger(v), { error: `must be an integer in ${range}` })
    .refine((v) => v >= min && v <= max, { error: `must be an integer in ${range}` })
    .meta({ unit, min, max, integer: true, description } satisfies FieldInfo);
}

function fmtRange(min: number, max: number): string {
  return `[${fmtNum(min)}, ${fmtNum(max)}]`;
}

export function fmtNum(x: number): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  const p = Number(x.toPrecision(6));
  return a >= 1e-3 && a < 1e6 ? String(p) : p.toExponential().replace('e+', 'e');
}
