import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';

export interface FakeCamera {
  /** The Y4M file Chromium plays as its camera, over and over. */
  file: string;
  /** Chromium switches that stand this file in for a camera and grant camera access without asking. */
  args: string[];
  /**
   * The camera switches alone: the browser context's permissions then decide, so one browser can
   * serve a test that allows the camera (`permissions: ['camera']`) and one that is refused it.
   */
  deviceArgs: string[];
  dispose(): Promise<void>;
}

export interface FakeCameraOptions {
  /** Frame size in pixels; both must be even for 4:2:0 chroma. */
  width?: number;
  height?: number;
  /** Background around the picture, as a camera sees a desk or a shelf around a label. */
  background?: string;
}

/** BT.601 limited-range RGB → Y'CbCr 4:2:0 (chroma averaged over each 2×2 block), the usual reading of 8-bit Y4M video. */
function toYuv420(rgb: Buffer, width: number, height: number): Buffer {
  const ySize = width * height;
  const cSize = (width / 2) * (height / 2);
  const out = Buffer.alloc(ySize + 2 * cSize);
  for (let i = 0; i < ySize; i++) {
    const r = rgb[i * 3]!;
    const g = rgb[i * 3 + 1]!;
    const b = rgb[i * 3 + 2]!;
    out[i] = Math.round(16 + (65.481 * r + 128.553 * g + 24.966 * b) / 255);
  }
  for (let cy = 0; cy < height / 2; cy++) {
    for (let cx = 0; cx < width / 2; cx++) {
      let r = 0;
      let g = 0;
      let b = 0;
      for (const [dx, dy] of [
        [0, 0],
        [1, 0],
        [0, 1],
        [1, 1],
      ] as const) {
        const p = ((cy * 2 + dy) * width + cx * 2 + dx) * 3;
        r += rgb[p]!;
        g += rgb[p + 1]!;
        b += rgb[p + 2]!;
      }
      r /= 4;
      g /= 4;
      b /= 4;
      const c = cy * (width / 2) + cx;
      out[ySize + c] = Math.round(128 + (-37.797 * r - 74.203 * g + 112 * b) / 255);
      out[ySize + cSize + c] = Math.round(128 + (112 * r - 93.786 * g - 18.214 * b) / 255);
    }
  }
  return out;
}

/**
 * A camera for Chromium made from one picture: the image is centred on a plain frame and written
 * as a YUV4MPEG2 (Y4M, 4:2:0) file, which Chromium's fake capture device plays in a loop when
 * started with `--use-file-for-fake-video-capture`.
 */
export async function fakeCameraFromImage(image: Buffer, opts: FakeCameraOptions = {}): Promise<FakeCamera> {
  const width = opts.width ?? 640;
  const height = opts.height ?? 480;
  if (width % 2 || height % 2) throw new Error('A 4:2:0 frame needs an even width and height.');
  const picture = await sharp(image)
    .resize({ width: Math.round(width * 0.8), height: Math.round(height * 0.8), fit: 'inside', kernel: 'nearest' })
    .flatten({ background: '#ffffff' })
    .png()
    .toBuffer();
  const rgb = await sharp({ create: { width, height, channels: 3, background: opts.background ?? '#d8d2c8' } })
    .composite([{ input: picture, gravity: 'centre' }])
    .removeAlpha()
    .raw()
    .toBuffer();
  const header = `YUV4MPEG2 W${width} H${height} F30:1 Ip A1:1 C420jpeg\n`;
  const frame = Buffer.concat([Buffer.from('FRAME\n'), toYuv420(rgb, width, height)]);
  const dir = await mkdtemp(path.join(os.tmpdir(), 'plinth-camera-'));
  const file = path.join(dir, 'camera.y4m');
  await writeFile(file, Buffer.concat([Buffer.from(header), frame]));
  return {
    file,
    args: ['--use-fake-device-for-media-stream', `--use-file-for-fake-video-capture=${file}`, '--use-fake-ui-for-media-stream'],
    deviceArgs: ['--use-fake-device-for-media-stream', `--use-file-for-fake-video-capture=${file}`],
    dispose: () => rm(dir, { recursive: true, force: true }),
  };
}
