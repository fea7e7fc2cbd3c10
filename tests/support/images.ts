import { PNG } from 'pngjs';

/** A small real PNG photo stand-in: a w×h gradient. */
export function pngImage(w = 64, h = 48): Buffer {
  const png = new PNG({ width: w, height: h });
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = (y * w + x) * 4;
      png.data[i] = (x * 255) / w;
      png.data[i + 1] = (y * 255) / h;
      png.data[i + 2] = 128;
      png.data[i + 3] = 255;
    }
  }
  return PNG.sync.write(png);
}

/** The first bytes of a Linux executable (ELF), padded: what a renamed program looks like. */
export const elfBytes = () => Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]), Buffer.alloc(512, 0)]);

export const htmlBytes = () => Buffer.from('<!doctype html><html><body><script>alert(1)</script></body></html>');
