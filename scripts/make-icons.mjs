#!/usr/bin/env node
// Draws the app's icons (the square wave of public/favicon.svg, white on the accent colour) as PNG files for the
// web app manifest: public/icons/icon-192.png, icon-512.png (rounded corners) and icon-maskable-512.png (full
// bleed, the wave inside the central 80 % safe zone). No image library: pixels, zlib and a CRC-32 of our own.
// Run after changing the drawing: node scripts/make-icons.mjs (the output is committed).
import { mkdirSync, writeFileSync } from 'node:fs';
import { deflateSync } from 'node:zlib';

const ACCENT = [0x0f, 0x5e, 0x7a];
const WHITE = [0xff, 0xff, 0xff];
/** The favicon's path on its 32-unit grid: M4 20h4v-8h4v8h4v-8h4v8h4v-8h4, stroke 2.5. */
const WAVE = [[4, 20], [8, 20], [8, 12], [12, 12], [12, 20], [16, 20], [16, 12], [20, 12], [20, 20], [24, 20], [24, 12], [28, 12]];
const STROKE = 2.5;

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32(bytes) {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
function chunk(type, data) {
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  out.write(type, 4, 'ascii');
  data.copy(out, 8);
  out.writeUInt32BE(crc32(out.subarray(4, 8 + data.length)), 8 + data.length);
  return out;
}
/** An RGBA image as a PNG file (colour type 6, 8 bits, no filter). */
function png(size, rgba) {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(size, 0);
  ihdr.writeUInt32BE(size, 4);
  ihdr[8] = 8; ihdr[9] = 6; ihdr[10] = 0; ihdr[11] = 0; ihdr[12] = 0;
  const raw = Buffer.alloc(size * (size * 4 + 1));
  for (let y = 0; y < size; y++) rgba.copy(raw, y * (size * 4 + 1) + 1, y * size * 4, (y + 1) * size * 4);
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw, { level: 9 })), chunk('IEND', Buffer.alloc(0))]);
}

/** Is grid point (x, y) on the wave's stroke (each segment a rectangle grown by half the stroke)? */
function onWave(x, y) {
  const h = STROKE / 2;
  for (let i = 1; i < WAVE.length; i++) {
    const [x0, y0] = WAVE[i - 1];
    const [x1, y1] = WAVE[i];
    if (x >= Math.min(x0, x1) - h && x <= Math.max(x0, x1) + h && y >= Math.min(y0, y1) - h && y <= Math.max(y0, y1) + h) return true;
  }
  return false;
}

function draw(size, { maskable }) {
  const rgba = Buffer.alloc(size * size * 4);
  const radius = maskable ? 0 : (6 / 32) * size;
  // Maskable: the 32-unit drawing shrunk into the central 80 % so no mask cuts the wave.
  const scale = maskable ? 0.8 : 1;
  const SS = 4; // 4×4 samples a pixel, for smooth edges
  for (let py = 0; py < size; py++) {
    for (let px = 0; px < size; px++) {
      let inBg = 0;
      let inWave = 0;
      for (let sy = 0; sy < SS; sy++) {
        for (let sx = 0; sx < SS; sx++) {
          const x = px + (sx + 0.5) / SS;
          const y = py + (sy + 0.5) / SS;
          const cx = Math.min(Math.max(x, radius), size - radius);
          const cy = Math.min(Math.max(y, radius), size - radius);
          if ((x - cx) ** 2 + (y - cy) ** 2 > radius ** 2) continue;
          inBg++;
          const gx = ((x / size - 0.5) / scale + 0.5) * 32;
          const gy = ((y / size - 0.5) / scale + 0.5) * 32;
          if (onWave(gx, gy)) inWave++;
        }
      }
      const i = (py * size + px) * 4;
      const t = inBg ? inWave / inBg : 0;
      for (let c = 0; c < 3; c++) rgba[i + c] = Math.round(ACCENT[c] * (1 - t) + WHITE[c] * t);
      rgba[i + 3] = Math.round((255 * inBg) / (SS * SS));
    }
  }
  return png(size, rgba);
}

mkdirSync('public/icons', { recursive: true });
writeFileSync('public/icons/icon-192.png', draw(192, { maskable: false }));
writeFileSync('public/icons/icon-512.png', draw(512, { maskable: false }));
writeFileSync('public/icons/icon-maskable-512.png', draw(512, { maskable: true }));
console.log('Wrote public/icons/icon-192.png, icon-512.png, icon-maskable-512.png');
