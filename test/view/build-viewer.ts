// Builds the viewer once into a temporary folder with vite's own API, so the tests see the current source.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';

/** The viewer's vite config. */
export const VIEWER_CONFIG = fileURLToPath(new URL('../../viewer/vite.config.ts', import.meta.url));

/** Returns the folder of a fresh viewer build and a function that removes it. */
export async function buildViewerTemp(): Promise<{ dir: string; remove: () => void }> {
  const dir = mkdtempSync(join(tmpdir(), 'jointloom-viewer-'));
  await build({ configFile: VIEWER_CONFIG, logLevel: 'error', build: { outDir: dir, emptyOutDir: true } });
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}
