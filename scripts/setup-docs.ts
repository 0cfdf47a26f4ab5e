// Regenerate docs/setup-reference.md and docs/setup.schema.json from the schema: `npm run docs`.
import { writeFileSync } from 'node:fs';
import { setupJsonSchema, setupReferenceMarkdown } from '../core/setup/reference.ts';

const HEAD = `# Setup file reference (version 1)

Generated from \`core/setup/schema.ts\` by \`npm run docs\`; do not edit by hand. Units: energies in eV (momentum as
p·c in eV), times in s, lengths in m, voltages in V, phases in degrees. A complete example:
[examples/alder-booster.json](../examples/alder-booster.json) (a fictional machine). Older versions are migrated on load.

`;
writeFileSync(new URL('../docs/setup-reference.md', import.meta.url), HEAD + setupReferenceMarkdown());
writeFileSync(new URL('../docs/setup.schema.json', import.meta.url), JSON.stringify(setupJsonSchema(), null, 2) + '\n');
