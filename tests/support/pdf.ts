import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

/** Text of every page of a PDF, read by an independent PDF library (Mozilla's pdf.js). */
export async function pdfText(bytes: Buffer): Promise<{ pages: number; text: string; info: Record<string, unknown> }> {
  const doc = await getDocument({ data: new Uint8Array(bytes), useSystemFonts: false, isEvalSupported: false, verbosity: 0 }).promise;
  const parts: string[] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const page = await doc.getPage(i);
    const content = await page.getTextContent();
    parts.push(content.items.map((it) => ('str' in it ? it.str : '')).join(' '));
  }
  const meta = await doc.getMetadata();
  const pages = doc.numPages;
  await doc.destroy();
  return { pages, text: parts.join('\n'), info: meta.info as Record<string, unknown> };
}
