/**
 * CRC-32 (the IEEE 802.3 polynomial, reflected: 0xEDB88320, initial value and final xor 0xFFFFFFFF),
 * the checksum of zip, gzip and PNG; check value CRC-32("123456789") = 0xCBF43926 (common practice).
 * Table-driven, one byte per step.
 */
const TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 of `bytes` as an unsigned 32-bit integer. */
export function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (let i = 0; i < bytes.length; i++) c = TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** Eight lower-case hex digits. */
export function hex32(x: number): string {
  return (x >>> 0).toString(16).padStart(8, '0');
}
