// Writing files so that a reader never sees half of one: write a temp file beside it, then rename.
import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

/** Writes `data` to `path` atomically (temp file in the same folder, fsync, rename); returns the path. */
export function writeFileAtomic(path: string, data: string | Uint8Array): string {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, 'w');
    if (typeof data === 'string') writeSync(fd, data, null, 'utf8');
    else writeSync(fd, data);
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    renameSync(tmp, path);
  } catch (err) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    throw err;
  }
  return path;
}
