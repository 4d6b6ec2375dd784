// Writing files so that a reader never sees half of one: write a temp file beside it, then rename.
import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

/** One file to write: where, and what. */
export interface FileToWrite {
  path: string;
  data: string | Uint8Array;
}

/** Writes `data` to `path` atomically (temp file in the same folder, fsync, rename); returns the path. */
export function writeFileAtomic(path: string, data: string | Uint8Array): string {
  writeFilesAtomic([{ path, data }]);
  return path;
}

/**
 * Writes several files so that a failure leaves none of them changed: every temp file is written and
 * synced first, and only when all are on disk is each renamed over its target.
 */
export function writeFilesAtomic(files: readonly FileToWrite[]): void {
  const temps: string[] = [];
  try {
    for (const f of files) temps.push(writeTemp(f));
  } catch (err) {
    for (const t of temps) rmSync(t, { force: true });
    throw err;
  }
  files.forEach((f, i) => renameSync(temps[i]!, f.path));
}

/** Writes one file's temp twin and returns its name; on failure removes it and names the file asked for. */
function writeTemp({ path, data }: FileToWrite): string {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, 'w');
    if (typeof data === 'string') writeSync(fd, data, null, 'utf8');
    else writeSync(fd, data);
    fsyncSync(fd);
    closeSync(fd);
    return tmp;
  } catch (err) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    // The temp name is ours, not the user's: a failure to create it (missing folder, no permission) names the file asked for.
    if (err instanceof Error && (err as NodeJS.ErrnoException).path === tmp) (err as NodeJS.ErrnoException).path = path;
    throw err;
  }
}
