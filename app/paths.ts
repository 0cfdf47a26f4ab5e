// Paths into the setup document: the editor addresses fields by path, and validation issues come back as
// dotted strings ("rf.systems[0].voltage"); both use the same key so errors land next to their field.

/** One step into the document: an object key or an array index. */
export type PathSeg = string | number;

/** The dotted key parseSetup uses for a path. */
export function pathKey(path: readonly PathSeg[]): string {
  return path.map((k) => (typeof k === 'number' ? `[${k}]` : `.${k}`)).join('').replace(/^\./, '');
}

/** Value at a path, or undefined. */
export function getIn(doc: unknown, path: readonly PathSeg[]): unknown {
  let v = doc;
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PathSeg, unknown>)[k];
  }
  return v;
}

/** Copy of doc with the value at path replaced (copy-on-write along the path); undefined removes the key. */
export function setIn(doc: unknown, path: readonly PathSeg[], value: unknown): unknown {
  if (path.length === 0) return value;
  const [k, ...rest] = path;
  const base = doc !== null && typeof doc === 'object' ? doc : typeof k === 'number' ? [] : {};
  const copy = (Array.isArray(base) ? [...base] : { ...(base as object) }) as Record<PathSeg, unknown>;
  const next = setIn((base as Record<PathSeg, unknown>)[k], rest, value);
  if (next === undefined && !Array.isArray(copy)) delete copy[k]; // undefined removes an optional field
  else copy[k] = next;
  return copy;
}
