import QRCode from 'qrcode';

export type QrErrorCorrection = 'L' | 'M' | 'Q' | 'H';

export interface QrOptions {
  /**
   * How much of the symbol may be lost and still read: L 7 %, M 15 %, Q 25 %, H 30 %.
   * Plinth prints codes on cards carried around a workshop and on labels in a dusty store, so
   * the default is Q: a scuff or a thumbprint does not stop the read, and a link still fits a
   * small version with large modules.
   */
  errorCorrection?: QrErrorCorrection;
  /** The light margin around the symbol, in modules; readers need it to find the finder patterns. */
  quietZone?: number;
}

export const QR_DEFAULTS: Required<QrOptions> = { errorCorrection: 'Q', quietZone: 4 };

/** The symbol's dark and light modules, without the quiet zone. */
export interface QrMatrix {
  /** Modules along one side. */
  size: number;
  /** QR version chosen for the text (1–40). */
  version: number;
  isDark(row: number, col: number): boolean;
}

function resolve(opts: QrOptions): Required<QrOptions> {
  const quietZone = opts.quietZone ?? QR_DEFAULTS.quietZone;
  if (!Number.isInteger(quietZone) || quietZone < 0) throw new Error('The quiet zone must be a whole number of modules.');
  return { errorCorrection: opts.errorCorrection ?? QR_DEFAULTS.errorCorrection, quietZone };
}

/** Encodes the text; throws when it is empty or too long for a QR code at that error correction. */
export function qrMatrix(text: string, opts: QrOptions = {}): QrMatrix {
  const { errorCorrection } = resolve(opts);
  const code = QRCode.create(text, { errorCorrectionLevel: errorCorrection });
  const { size, data } = code.modules;
  return { size, version: code.version, isDark: (row, col) => data[row * size + col] === 1 };
}

/** A black-on-white PNG of the code; `scale` is pixels per module. */
export async function qrPng(text: string, opts: QrOptions & { scale?: number } = {}): Promise<Buffer> {
  const { errorCorrection, quietZone } = resolve(opts);
  return QRCode.toBuffer(text, {
    type: 'png',
    errorCorrectionLevel: errorCorrection,
    margin: quietZone,
    scale: opts.scale ?? 8,
    color: { dark: '#000000ff', light: '#ffffffff' },
  });
}

/** A scalable SVG document of the code, for pages and label sheets. */
export async function qrSvg(text: string, opts: QrOptions = {}): Promise<string> {
  const { errorCorrection, quietZone } = resolve(opts);
  return QRCode.toString(text, { type: 'svg', errorCorrectionLevel: errorCorrection, margin: quietZone, color: { dark: '#000000ff', light: '#ffffffff' } });
}

export interface PdfQrPlacement extends QrOptions {
  /** Left edge of the whole square, quiet zone included, in PDF points. */
  x: number;
  /** Top edge, in PDF points (PDFKit measures from the top). */
  y: number;
  /** Side of the whole square, quiet zone included, in PDF points. */
  size: number;
}

/**
 * Draws the code as vector squares on a PDFKit page: a white square with the quiet zone, then
 * each row's runs of dark modules as single rectangles, filled together so no hairline seams
 * show between them. Returns the side of one module in points, for callers checking print size.
 */
export function drawQr(doc: PDFKit.PDFDocument, text: string, placement: PdfQrPlacement): { moduleSize: number } {
  const { quietZone } = resolve(placement);
  const matrix = qrMatrix(text, placement);
  const moduleSize = placement.size / (matrix.size + 2 * quietZone);
  const originX = placement.x + quietZone * moduleSize;
  const originY = placement.y + quietZone * moduleSize;

  doc.save();
  doc.rect(placement.x, placement.y, placement.size, placement.size).fill('#ffffff');
  for (let row = 0; row < matrix.size; row++) {
    let col = 0;
    while (col < matrix.size) {
      if (!matrix.isDark(row, col)) {
        col++;
        continue;
      }
      const start = col;
      while (col < matrix.size && matrix.isDark(row, col)) col++;
      doc.rect(originX + start * moduleSize, originY + row * moduleSize, (col - start) * moduleSize, moduleSize);
    }
  }
  doc.fill('#000000');
  doc.restore();
  return { moduleSize };
}
