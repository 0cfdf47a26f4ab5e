// The setup reference as Markdown, generated from the zod schema (units, ranges and descriptions live there).
import { z } from 'zod';
import { fmtNum } from './fields.ts';
import { setupSchema } from './schema.ts';

type Js = Record<string, unknown> & { properties?: Record<string, Js>; oneOf?: Js[]; items?: Js; required?: string[] };

/** JSON Schema (draft 2020-12) of the setup file, as written by users (defaults optional). */
export function setupJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(setupSchema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
}

/** Markdown table of every field: path, allowed values, unit, range, default, meaning. */
export function setupReferenceMarkdown(): string {
  const rows: string[] = ['| field | values | unit | range | default | meaning |', '|---|---|---|---|---|---|'];
  walk(setupJsonSchema() as Js, '', rows, '');
  return rows.join('\n') + '\n';
}

function walk(s: Js, path: string, rows: string[], when: string): void {
  if (s.oneOf) {
    const tags = s.oneOf.map((alt) => Object.entries(alt.properties ?? {}).find(([, v]) => v.const !== undefined));
    if (tags[0]) rows.push(`| \`${path}.${tags[0][0]}\` | ${tags.map((t) => `"${String(t?.[1].const)}"`).join(', ')} |  |  |  | selects the variant; the rows below marked "when" belong to one variant |`);
    for (const alt of s.oneOf) {
      const tag = Object.entries(alt.properties ?? {}).find(([, v]) => v.const !== undefined);
      walk(alt, path, rows, tag ? `${path}.${tag[0]} = "${String(tag[1].const)}"` : when);
    }
    return;
  }
  if (s.type === 'object' && s.properties) {
    for (const [k, v] of Object.entries(s.properties)) {
      const p = path ? `${path}.${k}` : k;
      if (v.const !== undefined && when.startsWith(p)) continue; // the tag itself is listed by its alternatives
      walk(v, p, rows, when);
    }
    return;
  }
  if (s.type === 'array' && s.items) {
    walk(s.items, `${path}[]`, rows, when);
    return;
  }
  const values = s.enum ? (s.enum as unknown[]).map((e) => `"${String(e)}"`).join(', ') : s.const !== undefined ? `${JSON.stringify(s.const)}` : String(s.type ?? 'any') + (s.integer ? ' (integer)' : '');
  const range = typeof s.min === 'number' ? `${fmtNum(s.min)} … ${fmtNum(s.max as number)}` : '';
  const dflt = s.default !== undefined ? `\`${JSON.stringify(s.default)}\`` : '';
  const cond = when ? ` (when ${when})` : '';
  rows.push(`| \`${path}\` | ${values} | ${String(s.unit ?? '')} | ${range} | ${dflt} | ${String(s.description ?? '')}${cond} |`);
}
