// Command-line argument parsing: positional arguments plus --name value / --name=value options.
import { parseArgs } from 'node:util';
import { fmtNum } from '../core/setup/fields.ts';

export class UsageError extends Error {}

export interface ParsedArgs {
  command: string | undefined;
  positional: string[];
  options: Record<string, string | boolean | undefined>;
}

const OPTIONS = {
  turns: { type: 'string' },
  every: { type: 'string' },
  out: { type: 'string' },
  particles: { type: 'string' },
  format: { type: 'string' },
  samples: { type: 'string' },
  'filling-limit': { type: 'string' },
  'adiabatic-limit': { type: 'string' },
  help: { type: 'boolean', short: 'h' },
} as const;

/** Split argv into the command, its positional arguments and options. */
export function parseCommandLine(argv: string[]): ParsedArgs {
  try {
    const { values, positionals } = parseArgs({ args: argv, options: OPTIONS, allowPositionals: true, strict: true });
    return { command: positionals[0], positional: positionals.slice(1), options: values };
  } catch (e) {
    throw new UsageError((e as Error).message.replace(/\s*\n\s*/g, ' '));
  }
}

/** Read an integer option within [min, max], or the default. */
export function intOption(opts: ParsedArgs['options'], name: string, min: number, max: number, dflt: number): number {
  const raw = opts[name];
  if (raw === undefined) return dflt;
  const v = Number(raw);
  if (typeof raw !== 'string' || !Number.isInteger(v) || v < min || v > max)
    throw new UsageError(`--${name} = ${String(raw)}: must be an integer in [${min}, ${max}]`);
  return v;
}

/** Read a number option within [min, max], or undefined when absent. */
export function numOption(opts: ParsedArgs['options'], name: string, min: number, max: number): number | undefined {
  const raw = opts[name];
  if (raw === undefined) return undefined;
  const v = Number(raw);
  if (typeof raw !== 'string' || raw.trim() === '' || !Number.isFinite(v) || v < min || v > max)
    throw new UsageError(`--${name} = ${String(raw)}: must be a number in [${fmtNum(min)}, ${fmtNum(max)}]`);
  return v;
}
