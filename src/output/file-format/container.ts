/**
 * The binary container of chronomesh files (docs/solution-files.md §1): a fixed 16-byte preamble,
 * a JSON header, then 8-byte aligned little-endian arrays ("sections").
 *
 *   offset 0   8 bytes  magic 89 43 48 52 4D 0D 0A 1A  (\x89 "CHRM" CR LF ^Z)
 *   offset 8   u32 LE   H, byte length of the header
 *   offset 12  u32 LE   CRC-32 of the header bytes
 *   offset 16  H bytes  header: UTF-8 JSON object with `format`, `version`, the caller's fields,
 *                       `sections: [{ name, type, length, offset, crc32 }]` and `dataBytes`
 *   D = 16 + H rounded up to a multiple of 8: the data; section s occupies
 *                       [D + offset, D + offset + length·size(type)), offset a multiple of 8
 *   file length = D + dataBytes exactly.
 *
 * The magic's first byte is not ASCII and it holds CR LF and ^Z, so text-mode transfers and
 * foreign text files (JSON, CSV) fail at byte 0 (the same trick as PNG's signature, common
 * practice). Every section and the header carry a CRC-32, so a flipped byte is reported with the
 * section it lies in. Reading never trusts a length before checking it against the file size.
 */
import { CorruptFileError } from '../../errors';
import { crc32, hex32 } from '../../numerics/crc32';

export const MAGIC = Uint8Array.of(0x89, 0x43, 0x48, 0x52, 0x4d, 0x0d, 0x0a, 0x1a);
const PREAMBLE = 16;

export type SectionType = 'f64' | 'i32' | 'u8';
export type SectionArray = Float64Array | Int32Array | Uint8Array;
const SIZE: Record<SectionType, number> = { f64: 8, i32: 4, u8: 1 };
const LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

interface SectionEntry {
  name: string;
  type: SectionType;
  length: number;
  offset: number;
  crc32: string;
}

const align8 = (n: number): number => (n + 7) & ~7;

function typeOf(a: SectionArray): SectionType {
  return a instanceof Float64Array ? 'f64' : a instanceof Int32Array ? 'i32' : 'u8';
}

/** Bytes of `a` in little-endian order (a view when the platform is little-endian). */
function leBytes(a: SectionArray): Uint8Array {
  if (LITTLE_ENDIAN || a instanceof Uint8Array) return new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const out = new Uint8Array(a.byteLength);
  const dv = new DataView(out.buffer);
  for (let i = 0; i < a.length; i++) {
    if (a instanceof Float64Array) dv.setFloat64(8 * i, a[i]!, true);
    else dv.setInt32(4 * i, a[i]!, true);
  }
  return out;
}

/** Writes a container: `header` (plain JSON data) and named arrays. */
export function writeContainer(format: string, version: number, header: Record<string, unknown>, sections: Record<string, SectionArray>): Uint8Array {
  const entries: SectionEntry[] = [];
  const blobs: Uint8Array[] = [];
  let offset = 0;
  for (const [name, a] of Object.entries(sections)) {
    const b = leBytes(a);
    entries.push({ name, type: typeOf(a), length: a.length, offset, crc32: hex32(crc32(b)) });
    blobs.push(b);
    offset += align8(b.length);
  }
  const json = JSON.stringify({ format, version, ...header, sections: entries, dataBytes: offset });
  const head = new TextEncoder().encode(json);
  const start = align8(PREAMBLE + head.length);
  const out = new Uint8Array(start + offset);
  out.set(MAGIC, 0);
  const dv = new DataView(out.buffer);
  dv.setUint32(8, head.length, true);
  dv.setUint32(12, crc32(head), true);
  out.set(head, PREAMBLE);
  entries.forEach((e, i) => out.set(blobs[i]!, start + e.offset));
  return out;
}

/** A read container: its header and its checked sections. */
export interface Container {
  readonly header: Record<string, unknown>;
  /** Section `name` as a fresh typed array of `type` (length checked when `length` is given). */
  section(name: string, type: 'f64', length?: number): Float64Array;
  section(name: string, type: 'i32', length?: number): Int32Array;
  section(name: string, type: 'u8', length?: number): Uint8Array;
  /** Whether the file has a section `name` (for optional sections). */
  has(name: string): boolean;
}

function hexBytes(b: Uint8Array, from: number, n: number): string {
  return Array.from(b.subarray(from, from + n), (x) => x.toString(16).padStart(2, '0')).join(' ');
}

function looksLike(b: Uint8Array): string {
  const first = b.length > 0 ? b[0]! : -1;
  if (first === 0x7b || first === 0x5b) return ' (it looks like a JSON text)';
  if (first === 0x1f && b[1] === 0x8b) return ' (it looks like gzip data)';
  if (first === 0x3c) return ' (it looks like an XML/HTML text)';
  return '';
}

/**
 * Reads and checks a container of `format`, version `version`: magic, sizes, header checksum and
 * JSON, format name, version, the section table and every section's checksum.
 */
export function readContainer(bytes: Uint8Array, format: string, version: number): Container {
  if (!(bytes instanceof Uint8Array)) {
    throw new CorruptFileError(`expected the bytes of a ${format} file as a Uint8Array, received ${bytes === null ? 'null' : typeof bytes}`, 'foreign', { field: 'bytes', expected: 'Uint8Array', received: typeof bytes });
  }
  const n = bytes.length;
  const magicLen = Math.min(n, MAGIC.length);
  for (let i = 0; i < magicLen; i++) {
    if (bytes[i] !== MAGIC[i]) {
      throw new CorruptFileError(
        `not a ${format} file${looksLike(bytes)}: byte ${i} is ${hexBytes(bytes, i, 1)}, expected the signature ${hexBytes(MAGIC, 0, 8)} at offset 0, found ${hexBytes(bytes, 0, Math.min(8, n))}`,
        'foreign',
        { field: 'signature', offset: i, expected: hexBytes(MAGIC, 0, 8), received: hexBytes(bytes, 0, Math.min(8, n)) },
      );
    }
  }
  if (n < PREAMBLE) {
    throw new CorruptFileError(`truncated ${format} file: ${n} bytes, fewer than the ${PREAMBLE}-byte preamble`, 'truncated', { field: 'preamble', offset: n, expected: `≥ ${PREAMBLE} bytes`, received: `${n} bytes` });
  }
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const h = dv.getUint32(8, true);
  if (PREAMBLE + h > n) {
    throw new CorruptFileError(`truncated ${format} file: the header claims ${h} bytes from offset ${PREAMBLE}, but the file ends at ${n}`, 'truncated', { field: 'header', offset: n, expected: `≥ ${PREAMBLE + h} bytes`, received: `${n} bytes` });
  }
  const headBytes = bytes.subarray(PREAMBLE, PREAMBLE + h);
  const want = dv.getUint32(12, true);
  const got = crc32(headBytes);
  if (want !== got) {
    throw new CorruptFileError(`the header of the ${format} file is damaged: its CRC-32 is ${hex32(got)}, the file records ${hex32(want)}`, 'checksum', { field: 'header', offset: PREAMBLE, expected: hex32(want), received: hex32(got) });
  }
  let header: Record<string, unknown>;
  try {
    const parsed: unknown = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(headBytes));
    if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) throw new Error('not an object');
    header = parsed as Record<string, unknown>;
  } catch (e) {
    throw new CorruptFileError(`the header of the ${format} file is not a JSON object (${(e as Error).message})`, 'malformed', { field: 'header', offset: PREAMBLE, expected: 'a JSON object', received: 'unparsable text' });
  }
  if (header.format !== format) {
    throw new CorruptFileError(`not a ${format} file: its header names the format ${JSON.stringify(header.format)}`, 'foreign', { field: 'format', offset: PREAMBLE, expected: JSON.stringify(format), received: JSON.stringify(header.format) });
  }
  if (header.version !== version) {
    throw new CorruptFileError(
      `${format} file of version ${JSON.stringify(header.version)}; this build of chronomesh reads version ${version}${typeof header.version === 'number' && header.version > version ? ' (written by a newer chronomesh)' : ''}`,
      'version',
      { field: 'version', offset: PREAMBLE, expected: String(version), received: JSON.stringify(header.version) },
    );
  }
  const start = align8(PREAMBLE + h);
  const dataBytes = header.dataBytes;
  if (typeof dataBytes !== 'number' || !Number.isInteger(dataBytes) || dataBytes < 0) {
    throw new CorruptFileError(`the header's dataBytes must be an integer ≥ 0, found ${JSON.stringify(dataBytes)}`, 'malformed', { field: 'dataBytes', expected: 'integer ≥ 0', received: JSON.stringify(dataBytes) });
  }
  if (start + dataBytes > n) {
    throw new CorruptFileError(`truncated ${format} file: ${n} bytes, expected ${start + dataBytes} (header ${start} + data ${dataBytes})`, 'truncated', { field: 'data', offset: n, expected: `${start + dataBytes} bytes`, received: `${n} bytes` });
  }
  if (start + dataBytes < n) {
    throw new CorruptFileError(`${format} file has ${n - start - dataBytes} bytes after its end at offset ${start + dataBytes}`, 'malformed', { field: 'data', offset: start + dataBytes, expected: `${start + dataBytes} bytes`, received: `${n} bytes` });
  }
  const table = header.sections;
  if (!Array.isArray(table)) throw new CorruptFileError('the header has no section table', 'malformed', { field: 'sections', expected: 'array', received: typeof table });
  const byName = new Map<string, SectionEntry>();
  table.forEach((raw: unknown, i: number) => {
    const e = raw as Partial<SectionEntry> | null;
    const field = `sections[${i}]`;
    const bad = (what: string): never => {
      throw new CorruptFileError(`${field} (${JSON.stringify(e?.name)}) is malformed: ${what}`, 'malformed', { field, expected: what });
    };
    if (e === null || typeof e !== 'object') return bad('an object');
    if (typeof e.name !== 'string') return bad('a string name');
    if (e.type !== 'f64' && e.type !== 'i32' && e.type !== 'u8') return bad("type 'f64', 'i32' or 'u8'");
    if (typeof e.length !== 'number' || !Number.isInteger(e.length) || e.length < 0) return bad('an integer length ≥ 0');
    if (typeof e.offset !== 'number' || !Number.isInteger(e.offset) || e.offset < 0 || e.offset % 8 !== 0) return bad('an integer offset ≥ 0, a multiple of 8');
    if (e.offset + e.length * SIZE[e.type] > dataBytes) return bad(`bytes [${e.offset}, ${e.offset + e.length * SIZE[e.type]}) within the ${dataBytes} data bytes`);
    if (typeof e.crc32 !== 'string') return bad('a crc32 string');
    const b = bytes.subarray(start + e.offset, start + e.offset + e.length * SIZE[e.type]);
    const c = hex32(crc32(b));
    if (c !== e.crc32) {
      throw new CorruptFileError(`section '${e.name}' of the ${format} file is damaged: its CRC-32 is ${c}, the header records ${e.crc32}`, 'checksum', { field: e.name, offset: start + e.offset, expected: e.crc32, received: c });
    }
    byName.set(e.name, e as SectionEntry);
  });
  function section(name: string, type: SectionType, length?: number): SectionArray {
    const e = byName.get(name);
    if (!e) throw new CorruptFileError(`the ${format} file has no section '${name}'`, 'malformed', { field: name, expected: `a section '${name}'`, received: 'none' });
    if (e.type !== type) throw new CorruptFileError(`section '${name}' has type ${e.type}, expected ${type}`, 'malformed', { field: name, offset: start + e.offset, expected: type, received: e.type });
    if (length !== undefined && e.length !== length) {
      throw new CorruptFileError(`section '${name}' has ${e.length} entries, expected ${length}`, 'malformed', { field: name, offset: start + e.offset, expected: String(length), received: String(e.length) });
    }
    const from = start + e.offset, to = from + e.length * SIZE[type];
    // A fresh, aligned copy (a Node Buffer's slice would be a view into a shared pool).
    const copy = new Uint8Array(to - from);
    copy.set(bytes.subarray(from, to));
    if (type === 'u8') return copy;
    if (LITTLE_ENDIAN) return type === 'f64' ? new Float64Array(copy.buffer) : new Int32Array(copy.buffer);
    const v = new DataView(copy.buffer);
    if (type === 'f64') return Float64Array.from({ length: e.length }, (_, i) => v.getFloat64(8 * i, true));
    return Int32Array.from({ length: e.length }, (_, i) => v.getInt32(4 * i, true));
  }
  return { header, section: section as Container['section'], has: (name: string) => byName.has(name) };
}
