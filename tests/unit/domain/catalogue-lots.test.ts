import { describe, expect, it } from 'vitest';
import { lotRefusal, lotState, needsSolventCaution, type LotForTest } from '#shared/domain/catalogue.ts';
import { buildVocabulary, candidateKeys, resolveIngredient, type Ingredient } from '#shared/domain/ingredients.ts';
import { looksLikePdf, sheetFileName } from '#api/features/catalogue/sds.ts';

const at = new Date('2026-12-02T10:00:00Z');

describe('lotState', () => {
  it('reads the expiry date as the last day of use, warns 30 days ahead, and lets retirement win', () => {
    // common practice, no published source: a last-day-of-use date and a month's warning
    expect(lotState({ expiresOn: '2026-12-01', retiredAt: null }, at)).toBe('expired');
    expect(lotState({ expiresOn: '2026-12-02', retiredAt: null }, at)).toBe('expiring');
    expect(lotState({ expiresOn: '2026-12-31', retiredAt: null }, at)).toBe('expiring');
    expect(lotState({ expiresOn: '2027-01-01', retiredAt: null }, at)).toBe('in_date');
    expect(lotState({ expiresOn: '2028-01-01', retiredAt: '2026-11-01T00:00:00Z' }, at)).toBe('retired');
    expect(lotState({ expiresOn: null, retiredAt: null }, at)).toBe('in_date');
  });
});

describe('lotRefusal', () => {
  const lot: LotForTest = { lotId: 'l1', code: 'QA-2602', productId: 'quayside', formulationId: 'f1', expiresOn: '2027-06-30', retiredAt: null };
  it('accepts an in-date lot of the product being tested', () => {
    expect(lotRefusal(lot, 'quayside', at)).toBeNull();
  });
  it('refuses a missing lot, a lot of another product, a retired lot and an expired one, each in words', () => {
    expect(lotRefusal(undefined, 'quayside', at)).toBe('That lot is not in the catalogue.');
    expect(lotRefusal(lot, 'breakwater', at)).toBe('Lot QA-2602 belongs to another product.');
    expect(lotRefusal({ ...lot, retiredAt: new Date('2026-11-01T00:00:00Z') }, 'quayside', at)).toBe('Lot QA-2602 has been retired and cannot be used for a test.');
    expect(lotRefusal({ ...lot, expiresOn: '2026-12-01' }, 'quayside', at)).toBe('Lot QA-2602 expired on 2026-12-01 and cannot be used for a test.');
  });
});

describe('needsSolventCaution', () => {
  const solvent = { group: 'solvents', trivial: false };
  const water = { group: 'other', trivial: true };
  const resin = { group: 'acrylates', trivial: false };
  it('marks every remover, whatever its list says', () => {
    expect(needsSolventCaution('remover', null)).toBe(true);
    expect(needsSolventCaution('remover', [resin])).toBe(true);
  });
  it('marks a product whose largest ingredient (first on the label, carriers aside) is a solvent', () => {
    // INCI lists run in descending order of weight (Regulation (EC) 1223/2009 Art. 19; lexoraeu)
    expect(needsSolventCaution('sealer', [solvent, resin])).toBe(true);
    expect(needsSolventCaution('adhesive', [water, solvent, resin])).toBe(true);
    expect(needsSolventCaution('adhesive', [water, resin, solvent])).toBe(false);
    expect(needsSolventCaution('adhesive', null)).toBe(false);
  });
});

describe('candidateKeys', () => {
  const vocab = buildVocabulary([
    { inci: 'Aqua', synonyms: ['Water'], cas: '7732-18-5', group: 'other', trivial: true },
    { inci: 'Parfum', synonyms: ['Fragrance'], cas: null, group: 'fragrance', trivial: false },
  ] satisfies Ingredient[]);
  it('covers every key resolveIngredient may look a name up under', () => {
    for (const name of ['Aqua/Water', 'Parfum (Fragrance)', 'Water', 'Fragrance (Parfum)']) {
      const hit = resolveIngredient(name, vocab)!;
      const keys = candidateKeys(name);
      expect([hit.inci, ...hit.synonyms].some((n) => keys.includes(n.toLowerCase())), name).toBe(true);
    }
  });
  it('keeps a copolymer whole: its slash joins monomers, not names', () => {
    expect(candidateKeys('Acrylates/Ethylhexyl Acrylate Copolymer')).toEqual(['acrylatesethylhexylacrylatecopolymer']);
  });
});

describe('looksLikePdf and sheetFileName', () => {
  it('accepts a PDF by its header and end marker only (ISO 32000: "%PDF-1.n" header, "%%EOF" trailer, from memory)', () => {
    expect(looksLikePdf(Buffer.from('%PDF-1.7\n1 0 obj\n<<>>\nendobj\ntrailer\n<<>>\n%%EOF\n'))).toBe(true);
    expect(looksLikePdf(Buffer.from('%PDF-2.0\n%%EOF'))).toBe(true);
    expect(looksLikePdf(Buffer.from('%PDF-1.7 truncated'))).toBe(false);
    expect(looksLikePdf(Buffer.from(' %PDF-1.7\n%%EOF'))).toBe(false);
    expect(looksLikePdf(Buffer.from('GIF89a%%EOF'))).toBe(false);
  });
  it('keeps only a tidy base name ending in .pdf', () => {
    expect(sheetFileName('C:\\Users\\marta\\Downloads\\Tidewater SDS.PDF')).toBe('Tidewater SDS.PDF');
    expect(sheetFileName('../../etc/passwd')).toBe('passwd.pdf');
    expect(sheetFileName(undefined)).toBe('safety-data-sheet.pdf');
    expect(sheetFileName('"<x>|.pdf')).toBe('x.pdf');
  });
});
