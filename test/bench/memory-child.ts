// Child process for the memory measurement: in "baseline" mode it loads the parser and stops; in
// "parse" mode it also parses the file with readBvhFile. Prints one JSON line of its memory figures.
import { readFileSync } from 'node:fs';
import { readBvhFile } from '../../src/bvh/index.js';

/**
 * Returns this process's peak resident set in bytes. On Linux it is VmHWM of /proc/self/status, the
 * high-water mark of this process image alone: getrusage's ru_maxrss (process.resourceUsage().maxRSS)
 * keeps the peak of the forked parent image across exec, so a child of a big benchmark process would
 * report the parent's size.
 */
function peakRss(): { bytes: number; source: string } {
  try {
    const m = /^VmHWM:\s+(\d+)\s+kB/m.exec(readFileSync('/proc/self/status', 'utf8'));
    if (m) return { bytes: Number(m[1]) * 1024, source: 'VmHWM' };
  } catch {
    // not Linux
  }
  return { bytes: process.resourceUsage().maxRSS * 1024, source: 'maxRSS' };
}

const [mode, path] = process.argv.slice(2);
const gc = (globalThis as { gc?: () => void }).gc;
gc?.();
const before = process.memoryUsage();
let values = 0;
if (mode === 'parse' && path) {
  const take = readBvhFile(path);
  values = take.values.length;
  gc?.();
}
const after = process.memoryUsage();
const peak = peakRss();
process.stdout.write(
  JSON.stringify({
    mode,
    peakRssBytes: peak.bytes,
    peakSource: peak.source,
    rssBefore: before.rss,
    rssAfter: after.rss,
    arrayBuffersBefore: before.arrayBuffers,
    arrayBuffersAfter: after.arrayBuffers,
    heapUsedAfter: after.heapUsed,
    values,
    gc: Boolean(gc),
  }) + '\n',
);
