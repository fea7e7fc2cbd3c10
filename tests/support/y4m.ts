import { PNG } from 'pngjs';

/**
 * Turns a PNG (a QR label) into a short Y4M video that Chromium can play as a fake camera
 * (--use-file-for-fake-video-capture). The image is scaled up by whole pixels, centred on white,
 * and written as grey-scale 4:2:0 frames.
 */
export function pngToY4m(png: Buffer, { width = 640, height = 480, frames = 10 } = {}): Buffer {
  const img = PNG.sync.read(png);
  const scale = Math.max(1, Math.floor(Math.min((width * 0.8) / img.width, (height * 0.8) / img.height)));
  const ox = Math.floor((width - img.width * scale) / 2);
  const oy = Math.floor((height - img.height * scale) / 2);
  const y = Buffer.alloc(width * height, 235); // video white
  for (let py = 0; py < img.height * scale; py++) {
    for (let px = 0; px < img.width * scale; px++) {
      const i = (Math.floor(py / scale) * img.width + Math.floor(px / scale)) * 4;
      // BT.601 luma, squeezed into video range 16–235
      const luma = 0.299 * img.data[i]! + 0.587 * img.data[i + 1]! + 0.114 * img.data[i + 2]!;
      y[(oy + py) * width + ox + px] = Math.round(16 + (luma * 219) / 255);
    }
  }
  const chroma = Buffer.alloc((width / 2) * (height / 2), 128);
  const frame = Buffer.concat([Buffer.from('FRAME\n'), y, chroma, chroma]);
  const header = Buffer.from(`YUV4MPEG2 W${width} H${height} F10:1 Ip A1:1 C420jpeg\n`);
  return Buffer.concat([header, ...Array.from({ length: frames }, () => frame)]);
}
