// Static files of the built viewer: a request path maps to a file inside the root or to nothing.
import { realpathSync, statSync } from 'node:fs';
import { extname, join, sep } from 'node:path';

/** Content types of the files a vite build writes. */
export const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
};

/** Returns the real path of a file inside `root` (itself a real path) for a raw URL path, or null (404). */
export function resolveStatic(root: string, rawPath: string): string | null {
  if (!rawPath.startsWith('/')) return null;
  let decoded: string;
  try {
    decoded = decodeURIComponent(rawPath);
  } catch {
    return null;
  }
  if (decoded.includes('\0') || decoded.includes('\\')) return null;
  const rel = decoded === '/' ? 'index.html' : decoded.slice(1);
  const parts = rel.split('/');
  // No empty, dot, dot-dot or hidden segments: nothing outside the built files can be named.
  if (parts.some((p) => p === '' || p.startsWith('.'))) return null;
  if (!(extname(rel) in CONTENT_TYPES)) return null;
  const full = join(root, ...parts);
  if (!full.startsWith(root + sep)) return null;
  try {
    const real = realpathSync(full);
    if (!real.startsWith(root + sep)) return null;
    return statSync(real).isFile() ? real : null;
  } catch {
    return null;
  }
}
