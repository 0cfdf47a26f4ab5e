// The setup in the URL fragment: JSON → deflate → base64url, behind a prefix carrying the schema version
// ("#s1=…"), so a link names the format it was written in and older links can be migrated.
import { deflateSync, inflateSync, strFromU8, strToU8 } from 'fflate';
import { SETUP_VERSION } from '../core/setup/schema.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';
import type { Setup } from '../core/setup/schema.ts';

/** What a link fragment held: nothing, a valid setup, or the reasons it could not be opened. */
export type LinkResult =
  | { kind: 'none' }
  | { kind: 'ok'; setup: Setup; migratedFrom?: number }
  | { kind: 'error'; lines: string[] };

const FRAGMENT = /^#?s(\d+)=([A-Za-z0-9_-]*)$/;
// Limits against hostile links: a fragment longer than browsers keep in an address bar, or data that expands to
// more than a setup file could sensibly hold (deflate expands at most ~1032:1, so a short link can be a bomb).
const MAX_FRAGMENT_CHARS = 4_000_000;
const MAX_JSON_BYTES = 16_000_000;
const DEFLATE_MAX_RATIO = 1032;

/** Base64url (no padding) of bytes. */
export function toBase64Url(bytes: Uint8Array): string {
  let bin = '';
  for (let i = 0; i < bytes.length; i += 0x8000) bin += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

/** Bytes of a base64url string; throws on bad characters. */
export function fromBase64Url(s: string): Uint8Array {
  const b64 = s.replace(/-/g, '+').replace(/_/g, '/') + '==='.slice((s.length + 3) % 4);
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

/** Fragment (without '#') for a setup document. */
export function encodeSetup(doc: unknown): string {
  return `s${SETUP_VERSION}=${toBase64Url(deflateSync(strToU8(JSON.stringify(doc)), { level: 9 }))}`;
}

/** Decode and validate a location hash; says what was wrong instead of throwing. */
export function decodeFragment(hash: string): LinkResult {
  if (!hash || hash === '#') return { kind: 'none' };
  if (hash.length > MAX_FRAGMENT_CHARS)
    return { kind: 'error', lines: [`the link fragment has ${hash.length} characters; at most ${MAX_FRAGMENT_CHARS} are read (load large setups as a file)`] };
  const m = FRAGMENT.exec(hash);
  if (!m) return { kind: 'error', lines: [`the link fragment does not start with "#s${SETUP_VERSION}=" followed by base64url text`] };
  const linkVersion = Number(m[1]);
  if (linkVersion > SETUP_VERSION)
    return { kind: 'error', lines: [`the link was written by a newer version (setup version ${linkVersion}; this app reads up to ${SETUP_VERSION})`] };
  let text: string;
  try {
    const packed = fromBase64Url(m[2]);
    // Room for the largest possible output below the limit, plus one byte to notice an output past it.
    const out = new Uint8Array(Math.min(MAX_JSON_BYTES + 1, packed.length * DEFLATE_MAX_RATIO + 1024));
    const bytes = inflateSync(packed, { out });
    if (bytes.length > MAX_JSON_BYTES)
      return { kind: 'error', lines: [`the link data expands to more than ${MAX_JSON_BYTES} bytes; at most that is read (load large setups as a file)`] };
    text = strFromU8(bytes);
  } catch (e) {
    return { kind: 'error', lines: [`the link data could not be decompressed (${(e as Error).message || 'corrupt data'})`] };
  }
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    return { kind: 'error', lines: [`the link data is not valid JSON (${(e as Error).message})`] };
  }
  let r: ReturnType<typeof parseSetup>;
  try {
    r = parseSetup(doc);
  } catch (e) {
    return { kind: 'error', lines: [`the link data could not be checked (${(e as Error).message})`] }; // a fault in validation must not blank the page
  }
  if (!r.ok) return { kind: 'error', lines: r.errors.map(formatIssue) };
  return r.migratedFrom === undefined ? { kind: 'ok', setup: r.setup } : { kind: 'ok', setup: r.setup, migratedFrom: r.migratedFrom };
}
