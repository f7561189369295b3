/**
 * Minimal PNG decoder for the browser test: 8-bit truecolour (type 2) or
 * truecolour with alpha (type 6), not interlaced, which is what Chromium's
 * screenshots are. Follows the PNG specification (W3C, 2nd ed. / ISO/IEC
 * 15948): IHDR, concatenated IDAT inflated with zlib, then the per-row filters
 * None, Sub, Up, Average and Paeth (§9).
 */
import { inflateSync } from 'node:zlib';

export interface RgbaImage {
  width: number;
  height: number;
  /** RGBA, 4 bytes per pixel, rows top to bottom. */
  data: Uint8Array;
}

const SIGNATURE = [137, 80, 78, 71, 13, 10, 26, 10];

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = Math.abs(p - a);
  const pb = Math.abs(p - b);
  const pc = Math.abs(p - c);
  if (pa <= pb && pa <= pc) return a;
  return pb <= pc ? b : c;
}

export function decodePng(png: Uint8Array): RgbaImage {
  const buf = Buffer.from(png.buffer, png.byteOffset, png.byteLength);
  SIGNATURE.forEach((byte, i) => {
    if (buf[i] !== byte) throw new Error('not a PNG file');
  });
  let offset = 8;
  let width = 0;
  let height = 0;
  let colourType = -1;
  const idat: Buffer[] = [];
  while (offset < buf.length) {
    const length = buf.readUInt32BE(offset);
    const type = buf.toString('latin1', offset + 4, offset + 8);
    const body = buf.subarray(offset + 8, offset + 8 + length);
    if (type === 'IHDR') {
      width = body.readUInt32BE(0);
      height = body.readUInt32BE(4);
      const bitDepth = body[8];
      colourType = body[9];
      const interlace = body[12];
      if (bitDepth !== 8 || (colourType !== 2 && colourType !== 6) || interlace !== 0) {
        throw new Error(`unsupported PNG: depth ${bitDepth}, colour type ${colourType}, interlace ${interlace}`);
      }
    } else if (type === 'IDAT') {
      idat.push(body);
    } else if (type === 'IEND') {
      break;
    }
    offset += 12 + length; // length, type, body, CRC
  }
  const channels = colourType === 6 ? 4 : 3;
  const stride = width * channels;
  const raw = inflateSync(Buffer.concat(idat));
  if (raw.length !== height * (stride + 1)) throw new Error('PNG image data has the wrong size');
  const pixels = new Uint8Array(height * stride);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    const src = y * (stride + 1) + 1;
    const dst = y * stride;
    for (let x = 0; x < stride; x++) {
      const a = x >= channels ? pixels[dst + x - channels] : 0;
      const b = y > 0 ? pixels[dst - stride + x] : 0;
      const c = x >= channels && y > 0 ? pixels[dst - stride + x - channels] : 0;
      const value = raw[src + x];
      let predicted: number;
      switch (filter) {
        case 0: predicted = 0; break;
        case 1: predicted = a; break;
        case 2: predicted = b; break;
        case 3: predicted = (a + b) >> 1; break;
        case 4: predicted = paeth(a, b, c); break;
        default: throw new Error(`unknown PNG filter ${filter} on row ${y}`);
      }
      pixels[dst + x] = (value + predicted) & 0xff;
    }
  }
  if (channels === 4) return { width, height, data: pixels };
  const rgba = new Uint8Array(width * height * 4);
  for (let p = 0; p < width * height; p++) {
    rgba[p * 4] = pixels[p * 3];
    rgba[p * 4 + 1] = pixels[p * 3 + 1];
    rgba[p * 4 + 2] = pixels[p * 3 + 2];
    rgba[p * 4 + 3] = 255;
  }
  return { width, height, data: rgba };
}

/** Pixels whose every channel is within `tolerance` of the colour ("#rrggbb"). */
export function countColour(image: RgbaImage, hex: string, tolerance: number): number {
  const r = parseInt(hex.slice(1, 3), 16);
  const g = parseInt(hex.slice(3, 5), 16);
  const b = parseInt(hex.slice(5, 7), 16);
  let n = 0;
  for (let p = 0; p < image.data.length; p += 4) {
    if (
      Math.abs(image.data[p] - r) <= tolerance &&
      Math.abs(image.data[p + 1] - g) <= tolerance &&
      Math.abs(image.data[p + 2] - b) <= tolerance
    ) n++;
  }
  return n;
}

/** Fraction of pixels that are not (nearly) white. */
export function nonWhiteFraction(image: RgbaImage): number {
  let n = 0;
  for (let p = 0; p < image.data.length; p += 4) {
    if (image.data[p] < 245 || image.data[p + 1] < 245 || image.data[p + 2] < 245) n++;
  }
  return n / (image.width * image.height);
}
