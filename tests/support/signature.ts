import sharp from 'sharp';

/** A finger-drawn-looking signature as a PNG data URL. */
export async function drawnSignature(): Promise<string> {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="600" height="200"><path d="M30 120 C 80 20, 120 180, 170 90 S 260 40, 300 120 S 420 160, 460 70 S 540 110, 570 90" stroke="#111" stroke-width="5" fill="none"/></svg>`;
  return `data:image/png;base64,${(await sharp(Buffer.from(svg)).png().toBuffer()).toString('base64')}`;
}

/** An empty, transparent pad: what a submit without signing sends. */
export async function emptySignature(): Promise<string> {
  const png = await sharp({ create: { width: 600, height: 200, channels: 4, background: { r: 0, g: 0, b: 0, alpha: 0 } } }).png().toBuffer();
  return `data:image/png;base64,${png.toString('base64')}`;
}
