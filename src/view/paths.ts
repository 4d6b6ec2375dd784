// Where the built viewer lives: dist/viewer at the package root, two folders up from src/view and dist/view alike.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Returns the folder of the built viewer (JOINTLOOM_VIEWER_DIR overrides it). */
export function viewerRoot(): string {
  return process.env.JOINTLOOM_VIEWER_DIR ?? join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'dist', 'viewer');
}
