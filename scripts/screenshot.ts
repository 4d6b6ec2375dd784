// Renders an HTML file (a report) in headless Chromium to PNG clips of at most 1200 px height, so that
// a contributor can look at it. Usage: npx tsx scripts/screenshot.ts report.html out-prefix
import { launchChromium } from '../test/browser/chromium.js';
import { resolve } from 'node:path';

const [html, prefix] = process.argv.slice(2);
if (!html || !prefix) {
  console.error('usage: npx tsx scripts/screenshot.ts <file.html> <out-prefix>');
  process.exit(2);
}
const { context, close } = await launchChromium();
try {
  const page = await context.newPage();
  await page.goto(`file://${resolve(html)}`);
  const height = (await page.evaluate('document.body.scrollHeight')) as number;
  const step = 1200;
  for (let y = 0, k = 0; y < height; y += step, k++) {
    const path = `${prefix}-${k}.png`;
    await page.screenshot({ path, clip: { x: 0, y, width: 1280, height: Math.min(step, height - y) }, fullPage: true });
    console.log(path);
  }
} finally {
  await close();
}
