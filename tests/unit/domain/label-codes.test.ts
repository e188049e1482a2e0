import calculateLuhnModN from 'calculate-luhn-mod-n';
import { describe, expect, it } from 'vitest';
import {
  isValidLabelCode,
  LABEL_ALPHABET,
  LABEL_CODE_SPACE,
  labelCodeFromNumber,
  labelCodeFromUrl,
  labelUrl,
  luhnModNCheckCharacter,
  luhnModNValid,
  parseLabelCode,
} from '#shared/domain/label-codes.ts';

/** The npm package calculate-luhn-mod-n, used as an independent implementation of Luhn mod N. */
const reference = (alphabet: string, input: string) =>
  calculateLuhnModN(
    (ch) => alphabet.indexOf(ch),
    (cp) => alphabet[cp]!,
    alphabet.length,
    input,
  );

/** A small fixed pseudo-random sequence (a linear congruential generator), so the sample is the same every run. */
function* numbers(count: number, seed = 12345): Generator<number> {
  let x = seed;
  for (let i = 0; i < count; i++) {
    x = (x * 1_103_515_245 + 12_345) % 2 ** 31;
    yield x % LABEL_CODE_SPACE;
  }
}

describe('Luhn mod N check character', () => {
  it('matches the published worked example for the alphabet "abcdef"', () => {
    // Wikipedia, "Luhn mod N algorithm": input "abcdef" over "abcdef" has check character "e".
    expect(luhnModNCheckCharacter('abcdef', 'abcdef')).toBe('e');
    expect(luhnModNValid('abcdefe', 'abcdef')).toBe(true);
  });
  it('reduces to the base-ten Luhn check digit', () => {
    // Wikipedia, "Luhn algorithm" (the ISO/IEC 7812-1 check digit): 7992739871 has check digit 3.
    expect(luhnModNCheckCharacter('7992739871', '0123456789')).toBe('3');
    // The widely published card-number test value 4111 1111 1111 1111 passes the Luhn check.
    expect(luhnModNValid('4111111111111111', '0123456789')).toBe(true);
    expect(luhnModNValid('4111111111111112', '0123456789')).toBe(false);
  });
  it('matches the base-36 example in the calculate-luhn-mod-n documentation', () => {
    // calculate-luhn-mod-n README: "1134806PJFB000010013CD18" gets "D" over 0-9A-Z.
    expect(luhnModNCheckCharacter('1134806PJFB000010013CD18', '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ')).toBe('D');
  });
  it('agrees with the calculate-luhn-mod-n package on 2,000 label bodies', () => {
    for (const n of numbers(2000)) {
      const code = labelCodeFromNumber('cast', n);
      const body = code.slice(2, -1);
      expect(code.slice(-1), code).toBe(reference(LABEL_ALPHABET, body));
    }
  });
  it('refuses to check a character outside the alphabet', () => {
    expect(() => luhnModNCheckCharacter('AB!', LABEL_ALPHABET)).toThrow(RangeError);
    expect(luhnModNValid('AB!', LABEL_ALPHABET)).toBe(false);
  });
});

describe('what the check character catches', () => {
  const sample = [...numbers(150, 99)].map((n) => labelCodeFromNumber('cast', n));
  it('every single wrong character, in every position', () => {
    for (const code of sample) {
      const chars = code.slice(2);
      for (let i = 0; i < chars.length; i++) {
        for (const wrong of LABEL_ALPHABET) {
          if (wrong === chars[i]) continue;
          const typo = `C-${chars.slice(0, i)}${wrong}${chars.slice(i + 1)}`;
          expect(isValidLabelCode(typo), typo).toBe(false);
        }
      }
    }
  });
  it('every swap of two neighbours except 0 and Z, Luhn’s known blind spot (09 ↔ 90 in base ten)', () => {
    // The reference package agrees the pair is invisible: "0Z" and "Z0" get the same check.
    expect(reference(LABEL_ALPHABET, '0Z')).toBe(reference(LABEL_ALPHABET, 'Z0'));
    const blind = `C-A0ZBC${reference(LABEL_ALPHABET, 'A0ZBC')}`;
    expect(isValidLabelCode(blind)).toBe(true);
    expect(isValidLabelCode(blind.replace('0Z', 'Z0'))).toBe(true);
    expect(isValidLabelCode(blind.replace('A0', '0A'))).toBe(false);
    for (const code of sample) {
      const chars = code.slice(2);
      for (let i = 0; i + 1 < chars.length; i++) {
        const [a, b] = [chars[i]!, chars[i + 1]!];
        if (a === b) continue;
        const swapped = `C-${chars.slice(0, i)}${b}${a}${chars.slice(i + 2)}`;
        const blindSpot = (a === '0' && b === 'Z') || (a === 'Z' && b === '0');
        expect(isValidLabelCode(swapped), swapped).toBe(blindSpot);
      }
    }
  });
});

describe('label codes', () => {
  it('look like C-7K3Q9G: kind letter, hyphen, five characters and a check character', () => {
    expect(labelCodeFromNumber('cast', 0)).toMatch(/^C-[0-9A-HJKMNP-TV-Z]{6}$/);
    expect(labelCodeFromNumber('location', LABEL_CODE_SPACE - 1)).toMatch(/^L-ZZZZZ.$/);
    expect(labelCodeFromNumber('cast', 0)).toBe(`C-00000${reference(LABEL_ALPHABET, '00000')}`);
  });
  it('gives each number its own code, and refuses numbers outside the space', () => {
    const codes = new Set(Array.from({ length: 1000 }, (_, i) => labelCodeFromNumber('cast', i * 33_331)));
    expect(codes.size).toBe(1000);
    expect(() => labelCodeFromNumber('cast', -1)).toThrow(RangeError);
    expect(() => labelCodeFromNumber('cast', LABEL_CODE_SPACE)).toThrow(RangeError);
    expect(() => labelCodeFromNumber('cast', 1.5)).toThrow(RangeError);
  });
  it('print only characters that cannot be confused: no I, L, O or U after the kind letter', () => {
    for (const n of numbers(500, 7)) expect(labelCodeFromNumber('location', n).slice(2)).not.toMatch(/[ILOU]/);
  });
});

describe('parseLabelCode', () => {
  const code = labelCodeFromNumber('cast', 1 * 32 ** 4 + 0 * 32 ** 3 + 1 * 32 ** 2 + 21 * 32 + 3);
  it('reads any case, without the hyphen, with spaces or another dash', () => {
    for (const typed of [code, code.toLowerCase(), code.replace('-', ''), ` ${code.replace('-', ' - ')} `, code.replace('-', '–')]) {
      expect(parseLabelCode(typed), typed).toEqual({ ok: true, target: 'cast', code });
    }
  });
  it('folds look-alikes: O is read as 0, I and L as 1', () => {
    expect(code.slice(2, 5)).toBe('101');
    const typed = `c-${'IOL'}${code.slice(5)}`;
    expect(parseLabelCode(typed)).toEqual({ ok: true, target: 'cast', code });
  });
  it('tells the kind apart by its letter', () => {
    const loc = labelCodeFromNumber('location', 4242);
    expect(parseLabelCode(loc)).toEqual({ ok: true, target: 'location', code: loc });
  });
  it('the example the format message gives is itself a valid code', () => {
    const r = parseLabelCode('nonsense');
    const example = r.ok ? '' : /for example (\S+?)\.$/.exec(r.message)?.[1];
    expect(example && isValidLabelCode(example)).toBe(true);
  });
  it('says whether a code is malformed or fails its check', () => {
    expect(parseLabelCode('X-123456')).toMatchObject({ ok: false, reason: 'format' });
    expect(parseLabelCode('C-12345')).toMatchObject({ ok: false, reason: 'format' });
    expect(parseLabelCode('C-1234567')).toMatchObject({ ok: false, reason: 'format' });
    expect(parseLabelCode('C-12U456')).toMatchObject({ ok: false, reason: 'format', message: expect.stringMatching(/\(U\)/) });
    const wrongLast = LABEL_ALPHABET[(LABEL_ALPHABET.indexOf(code.slice(-1)) + 1) % 32];
    expect(parseLabelCode(code.slice(0, -1) + wrongLast)).toMatchObject({ ok: false, reason: 'check', message: expect.stringMatching(/does not check out/) });
  });
});

describe('label URLs', () => {
  const code = labelCodeFromNumber('location', 90_210);
  it('open the label under the site’s own origin', () => {
    expect(labelUrl('https://plinth.example.test', code)).toBe(`https://plinth.example.test/archive/labels/${code}`);
    expect(labelUrl('https://plinth.example.test/', code)).toBe(`https://plinth.example.test/archive/labels/${code}`);
  });
  it('read back from a scanned QR, and refuse a label printed for another site', () => {
    const url = labelUrl('http://127.0.0.1:5173', code);
    expect(labelCodeFromUrl(url)).toEqual({ ok: true, target: 'location', code });
    expect(labelCodeFromUrl(`${url}/`, 'http://127.0.0.1:5173')).toEqual({ ok: true, target: 'location', code });
    expect(labelCodeFromUrl(url, 'https://plinth.example.test')).toMatchObject({ ok: false, message: 'This label was printed for a different site.' });
  });
  it('are not mistaken for other links or text', () => {
    expect(labelCodeFromUrl('https://plinth.example.test/performers/12')).toBeNull();
    expect(labelCodeFromUrl(code)).toBeNull();
    expect(labelCodeFromUrl('https://plinth.example.test/archive/labels/%E0%A4%A')).toMatchObject({ ok: false, reason: 'format' });
  });
});
