import { describe, expect, it } from 'vitest';
import { imageQrTexts, pdfPageQrTexts } from '../../support/pdf-qr.ts';
import { pdfText } from '../../support/pdf.ts';
import { api, as, ids, t, useApplicationApp } from './setup.ts';

useApplicationApp();

const binary = (res: { on: (e: string, cb: (c?: Buffer) => void) => void }, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c) => chunks.push(c!));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

describe("the performer's card", () => {
  it('prints the name and a QR code (read back with jsQR, an independent reader) that opens the check with the performer chosen', async () => {
    const pdf = await api().get(`/api/performers/${ids.juno}/card.pdf`).set('Cookie', as.artist).buffer(true).parse(binary);
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const url = `${t.config.appOrigin}/check?performerId=${ids.juno}`;
    expect(await pdfPageQrTexts(pdf.body as Buffer)).toEqual([url]);
    expect((await pdfText(pdf.body as Buffer)).text.replace(/\s+/g, ' ')).toContain('Juno Castellane');
    const png = await api().get(`/api/performers/${ids.juno}/card.png`).set('Cookie', as.head).buffer(true).parse(binary);
    expect(png.headers['content-type']).toBe('image/png');
    expect(await imageQrTexts(png.body as Buffer)).toEqual([url]);
  });
  it('is refused to a signed-in user with no role on the performer’s productions', async () => {
    expect((await api().get(`/api/performers/${ids.juno}/card.pdf`).set('Cookie', as.norole)).status).toBe(403);
    expect((await api().get('/api/performers/00000000-0000-4000-8000-000000000000/card.pdf').set('Cookie', as.artist)).status).toBe(404);
  });
});
