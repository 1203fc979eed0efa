#!/usr/bin/env node
/**
 * Draws the add-in icons (assets/icon-16.png … icon-80.png): a rounded teal tile with a pulse train in white
 * and its fundamental in amber, i.e. a waveform and one of its harmonics. Pure Node (zlib for the PNG data),
 * supersampled for smooth edges. Run: node scripts/make-icons.js
 */
'use strict';
const fs = require('fs');
const path = require('path');
const zlib = require('zlib');

const SIZES = [16, 32, 64, 80];
const OUT_DIR = path.join(__dirname, '..', 'assets');
const SS = 4; // samples per pixel along each axis

const TILE = [0x12, 0x6e, 0x73];
const PULSE = [0xff, 0xff, 0xff];
const TONE = [0xff, 0xb3, 0x2e];

/** Shapes in unit coordinates (0..1, y down), so every size is the same drawing. */
function pulsePath() {
  // two periods of a 50 % duty pulse train between x = 0.14 and 0.86 (period 0.36)
  const lo = 0.66, hi = 0.34;
  const xs = [0.14, 0.23, 0.41, 0.59, 0.77, 0.86];
  const pts = [[xs[0], lo]];
  for (let k = 1; k < xs.length - 1; k++) {
    const before = k % 2 === 1 ? lo : hi;
    pts.push([xs[k], before], [xs[k], before === lo ? hi : lo]);
  }
  pts.push([xs[xs.length - 1], lo]);
  return pts;
}

function tonePath() {
  const pts = [];
  for (let k = 0; k <= 64; k++) {
    const x = 0.14 + (0.72 * k) / 64;
    // the fundamental of that pulse train: same period, crests at the pulse centres
    pts.push([x, 0.5 - 0.27 * Math.cos((2 * Math.PI * (x - 0.32)) / 0.36)]);
  }
  return pts;
}

function distToPolyline(px, py, pts) {
  let best = Infinity;
  for (let i = 0; i + 1 < pts.length; i++) {
    const [ax, ay] = pts[i];
    const [bx, by] = pts[i + 1];
    const dx = bx - ax, dy = by - ay;
    const len2 = dx * dx + dy * dy;
    const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / len2));
    const ex = ax + t * dx - px, ey = ay + t * dy - py;
    best = Math.min(best, Math.hypot(ex, ey));
  }
  return best;
}

function insideRoundedSquare(x, y, r) {
  const cx = Math.min(Math.max(x, r), 1 - r);
  const cy = Math.min(Math.max(y, r), 1 - r);
  return (x - cx) ** 2 + (y - cy) ** 2 <= r * r && x >= 0 && x <= 1 && y >= 0 && y <= 1;
}

function render(size) {
  const pulse = pulsePath();
  const tone = tonePath();
  // Strokes stay at least about 1.3 px wide on the 16 px icon.
  const pulseHalf = Math.max(0.035, 0.6 / size);
  const toneHalf = Math.max(0.03, 0.55 / size);
  const rgba = Buffer.alloc(size * size * 4);
  for (let py = 0; py < size; py++) {
    for (let px = 0; px < size; px++) {
      let r = 0, g = 0, b = 0, a = 0;
      for (let sy = 0; sy < SS; sy++) {
        for (let sx = 0; sx < SS; sx++) {
          const x = (px + (sx + 0.5) / SS) / size;
          const y = (py + (sy + 0.5) / SS) / size;
          if (!insideRoundedSquare(x, y, 0.18)) continue;
          let c = TILE;
          if (distToPolyline(x, y, tone) <= toneHalf) c = TONE;
          if (distToPolyline(x, y, pulse) <= pulseHalf) c = PULSE;
          r += c[0]; g += c[1]; b += c[2]; a += 255;
        }
      }
      const n = SS * SS;
      const o = (py * size + px) * 4;
      // Colour is averaged over covered samples only (straight alpha), alpha over all samples.
      const cov = a / 255;
      rgba[o] = cov ? Math.round(r / cov) : 0;
      rgba[o + 1] = cov ? Math.round(g / cov) : 0;
      rgba[o + 2] = cov ? Math.round(b / cov) : 0;
      rgba[o + 3] = Math.round(a / n);
    }
  }
  return encodePng(size, size, rgba);
}

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

function crc32(buf) {
  let c = 0xffffffff;
  for (const byte of buf) c = CRC_TABLE[(c ^ byte) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type, data) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(td));
  return Buffer.concat([len, td, crc]);
}

function encodePng(w, h, rgba) {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0);
  ihdr.writeUInt32BE(h, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type RGBA
  const raw = Buffer.alloc(h * (1 + w * 4));
  for (let y = 0; y < h; y++) {
    raw[y * (1 + w * 4)] = 0; // filter: none
    rgba.copy(raw, y * (1 + w * 4) + 1, y * w * 4, (y + 1) * w * 4);
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', zlib.deflateSync(raw, { level: 9 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

if (require.main === module) {
  fs.mkdirSync(OUT_DIR, { recursive: true });
  for (const size of SIZES) {
    const file = path.join(OUT_DIR, `icon-${size}.png`);
    fs.writeFileSync(file, render(size));
    console.log(`wrote ${path.relative(process.cwd(), file)}`);
  }
}

module.exports = { render, SIZES };
