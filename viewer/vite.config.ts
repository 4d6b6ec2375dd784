// Builds the viewer into dist/viewer (relative asset paths, no public folder, nothing fetched at run time).
// JOINTLOOM_VIEWER_OUT sends the build elsewhere (the browser tests build into a temporary folder).
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

const here = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
  root: here,
  base: './',
  publicDir: false,
  logLevel: 'warn',
  build: {
    outDir: process.env.JOINTLOOM_VIEWER_OUT ?? fileURLToPath(new URL('../dist/viewer', import.meta.url)),
    emptyOutDir: true,
    sourcemap: false,
    target: 'es2022',
    chunkSizeWarningLimit: 1200,
    modulePreload: { polyfill: false },
  },
});
