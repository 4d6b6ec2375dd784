// Headless Debian Chromium through playwright-core, launched as this machine allows: a fresh profile,
// no sandbox (root), no GPU (WebGL through SwiftShader), no background network.
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

/** Path of Debian's chromium binary. */
export const CHROMIUM = process.env.JOINTLOOM_CHROMIUM ?? '/usr/bin/chromium';

/** Returns true when the browser binary is installed. */
export function haveChromium(): boolean {
  return existsSync(CHROMIUM);
}

/** Returns a headless persistent context on a fresh profile, and a function that closes and removes it. */
export async function launchChromium(): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const profile = mkdtempSync(join(tmpdir(), 'jointloom-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    viewport: { width: 1280, height: 900 },
  });
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
