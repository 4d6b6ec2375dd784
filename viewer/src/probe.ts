// Reads back the last rendered frame right after drawing it (same task, so no preserved buffer is
// needed): how many pixels differ from the background, how many carry each side's colour, and a hash.
import type { Color, WebGLRenderer } from 'three';
import type { ProbeResult } from './hook.js';


/** Returns pixel counts and an FNV-1a hash of the renderer's current drawing buffer. */
export function probe(renderer: WebGLRenderer, background: Color): ProbeResult {
  const gl = renderer.getContext();
  const width = gl.drawingBufferWidth, height = gl.drawingBufferHeight;
  const px = new Uint8Array(width * height * 4);
  gl.readPixels(0, 0, width, height, gl.RGBA, gl.UNSIGNED_BYTE, px);
  // Background is given in sRGB hex; three keeps Color in linear space, so convert back for comparison.
  const srgb = (c: number) => (c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055);
  const bgs = [background.r, background.g, background.b].map((c) => Math.round(srgb(c) * 255));
  let nonBackground = 0, left = 0, right = 0, hash = 0x811c9dc5;
  for (let i = 0; i < px.length; i += 4) {
    const r = px[i]!, g = px[i + 1]!, b = px[i + 2]!;
    if (Math.abs(r - bgs[0]!) > 6 || Math.abs(g - bgs[1]!) > 6 || Math.abs(b - bgs[2]!) > 6) nonBackground++;
    if (Math.abs(r - 0x0f) + Math.abs(g - 0x7b) + Math.abs(b - 0x74) < 40) left++;
    if (Math.abs(r - 0xb3) + Math.abs(g - 0x54) + Math.abs(b - 0x1e) < 40) right++;
    hash = Math.imul(hash ^ r, 16777619);
    hash = Math.imul(hash ^ g, 16777619);
    hash = Math.imul(hash ^ b, 16777619);
  }
  return { width, height, nonBackground, left, right, hash: hash >>> 0 };
}
