/**
 * Atomic file replacement (common practice on POSIX file systems): the bytes go to a temporary
 * file in the target's directory, are flushed to the disk (fsync), and the temporary file is then
 * renamed over the target, which replaces it in one step; the directory is flushed too, so the
 * rename itself survives a crash. A reader sees the old file or the new one, never a half-written
 * one, also when the writing process is killed.
 */
import { closeSync, fsyncSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { InvalidArgumentError } from '../index';

/** Writes `bytes` to `path` atomically (see the module comment). */
export function writeFileAtomic(path: string, bytes: Uint8Array, field = 'path'): void {
  if (typeof path !== 'string' || path.length === 0) throw new InvalidArgumentError(`${field} must be a non-empty file path`, { field, expected: 'a file path', received: typeof path });
  const target = resolve(path);
  const dir = dirname(target);
  const tmp = join(dir, `.${basename(target)}.${process.pid}.${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, 'wx', 0o644);
    let off = 0;
    while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    renameSync(tmp, target);
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    try { unlinkSync(tmp); } catch { /* already gone */ }
    throw new InvalidArgumentError(`cannot write ${field} ${JSON.stringify(path)}: ${(e as Error).message}`, { field, expected: 'a writable file path', received: path });
  }
  // Flush the directory entry (not supported on every platform; the data is safe either way).
  try {
    const dfd = openSync(dir, 'r');
    try { fsyncSync(dfd); } finally { closeSync(dfd); }
  } catch { /* e.g. Windows: directories cannot be opened */ }
}
