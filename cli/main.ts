// Phasewell command line: `bucket <setup.json>` and `track <setup.json> --turns N [--every K] [--out f.csv]
// [--particles p.csv]`. Bad input: one line naming the field, the value and the allowed range; exit code 2.
import { readFileSync, writeFileSync } from 'node:fs';
import { formatIssue, parseSetup, parseSetupText } from '../core/setup/validate.ts';
import type { Setup } from '../core/setup/schema.ts';
import { setupWarnings } from '../core/setup/warnings.ts';
import { intOption, numOption, parseCommandLine, UsageError } from './args.ts';
import { bucketReport } from './bucketReport.ts';
import { cycleCsv, cycleJson } from './cycle.ts';
import { particlesCsv, trackSetup } from './track.ts';

const USAGE = `usage:
  phasewell bucket <setup.json>
  phasewell track <setup.json> --turns N [--every K] [--out diagnostics.csv] [--particles final.csv]
  phasewell cycle <setup.json> [--format json|csv] [--out file] [--samples N] [--filling-limit F] [--adiabatic-limit A]
Results are for design exploration; machine protection and radiation safety follow local regulations and licensed practice.`;

class InputError extends Error {}

// Warnings do not stop the run: one line each on stderr after a successful command (a failure prints one line only).
const warnings: string[] = [];

function loadSetup(path: string | undefined): Setup {
  if (!path) throw new UsageError('missing <setup.json>');
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new InputError(`${path}: cannot read the file`);
  }
  const r = parseSetupText(text);
  if (!r.ok) throw new InputError(`${path}: ${r.errors.map(formatIssue).join('; ')}`);
  warnings.push(...setupWarnings(r.setup).map((w) => `phasewell: warning: ${formatIssue(w)}\n`));
  return r.setup;
}

function run(argv: string[]): number {
  const a = parseCommandLine(argv);
  if (a.options.help) {
    process.stdout.write(USAGE + '\n');
    return 0;
  }
  if (!a.command) throw new UsageError('missing command (expected bucket, track or cycle; --help shows the usage)');
  switch (a.command) {
    case 'bucket': {
      const setup = loadSetup(a.positional[0]);
      process.stdout.write(JSON.stringify(bucketReport(setup), null, 2) + '\n');
      return 0;
    }
    case 'track': {
      const setup = loadSetup(a.positional[0]);
      const turns = intOption(a.options, 'turns', 1, 100_000_000, setup.run.turns);
      const every = intOption(a.options, 'every', 1, 100_000_000, setup.run.diagnosticsEvery);
      // --turns may ask for more turns than the setup was checked for (a falling ramp could stop the particle).
      const again = parseSetup({ ...setup, run: { ...setup.run, turns } });
      if (!again.ok) throw new UsageError(`--turns = ${turns}: ${again.errors.map(formatIssue).join('; ')}`);
      const { log, tracker } = trackSetup(setup, { turns, every });
      const csv = log.toCsv();
      if (typeof a.options.out === 'string') writeFileSync(a.options.out, csv);
      else process.stdout.write(csv);
      if (typeof a.options.particles === 'string') writeFileSync(a.options.particles, particlesCsv(tracker));
      return 0;
    }
    case 'cycle': {
      const setup = loadSetup(a.positional[0]);
      const format = a.options.format ?? 'json';
      if (format !== 'json' && format !== 'csv') throw new UsageError(`--format = ${String(format)}: must be json or csv`);
      const opts = {
        samples: intOption(a.options, 'samples', 2, 100_000, 400),
        fillingLimit: numOption(a.options, 'filling-limit', 1e-6, 10),
        adiabaticLimit: numOption(a.options, 'adiabatic-limit', 1e-9, 1e6),
      };
      const text = format === 'csv' ? cycleCsv(setup, opts) : JSON.stringify(cycleJson(setup, opts), null, 2) + '\n';
      if (typeof a.options.out === 'string') writeFileSync(a.options.out, text);
      else process.stdout.write(text);
      return 0;
    }
    default:
      throw new UsageError(`unknown command "${a.command}" (expected bucket, track or cycle)`);
  }
}

try {
  process.exitCode = run(process.argv.slice(2));
  for (const w of warnings) process.stderr.write(w);
} catch (e) {
  if (e instanceof UsageError || e instanceof InputError) {
    process.stderr.write(`phasewell: ${e.message}\n`);
    process.exitCode = 2;
  } else {
    // A physics request the setup cannot satisfy (e.g. a bunch larger than the bucket) is also bad input.
    const text = e instanceof Error ? e.message : String(e);
    process.stderr.write(`phasewell: ${text.replace(/\s*\n\s*/g, ' ')}\n`);
    process.exitCode = 2;
  }
}
