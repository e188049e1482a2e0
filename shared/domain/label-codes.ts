/**
 * Printed label codes for casts and storage places, e.g. "C-7K3Q9G": a kind letter, five code
 * characters and a Luhn mod N check character, so a code misread off a dusty label is caught
 * before it opens the wrong record. The QR on each label holds the URL that opens it.
 */

/**
 * Crockford's base-32 alphabet: digits and capitals without I, L, O and U, so nothing printed can
 * be read as something else, and a typed O, I or L can be folded back to 0 or 1.
 */
export const LABEL_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/** Code characters before the check character: 32^5, about 33.5 million codes per kind. */
export const LABEL_BODY_LENGTH = 5;
/** How many distinct codes each kind has. */
export const LABEL_CODE_SPACE = LABEL_ALPHABET.length ** LABEL_BODY_LENGTH;

/** What a label can be stuck on. */
export const LABEL_TARGETS = ['cast', 'location'] as const;
/** A cast or a storage place. */
export type LabelTarget = (typeof LABEL_TARGETS)[number];

/** The kind letter printed first, so a person can tell a shelf label from a cast label at a glance. */
export const LABEL_PREFIXES: Record<LabelTarget, string> = { cast: 'C', location: 'L' };

/** The path under the site's origin that a label's QR opens. */
export const LABEL_PATH = '/archive/labels/';

/**
 * The Luhn mod N check character over `input` (every character must be in `alphabet`): doubling
 * every second character from the right catches every single wrong character and nearly every swap of neighbours.
 */
export function luhnModNCheckCharacter(input: string, alphabet: string): string {
  const n = alphabet.length;
  let factor = 2;
  let sum = 0;
  for (let i = input.length - 1; i >= 0; i--) {
    const codePoint = alphabet.indexOf(input[i]!);
    if (codePoint < 0) throw new RangeError(`"${input[i]}" is not in the check alphabet`);
    const addend = factor * codePoint;
    sum += Math.floor(addend / n) + (addend % n);
    factor = factor === 2 ? 1 : 2;
  }
  return alphabet[(n - (sum % n)) % n]!;
}

/** Whether the last character of `input` is the right Luhn mod N check character for the rest. */
export function luhnModNValid(input: string, alphabet: string): boolean {
  if (input.length < 2 || [...input].some((ch) => !alphabet.includes(ch))) return false;
  return luhnModNCheckCharacter(input.slice(0, -1), alphabet) === input.slice(-1);
}

/**
 * The label code for a whole number below LABEL_CODE_SPACE. Draw the number at random where the
 * code is stored and draw again if it is taken; sequential numbers would make neighbouring labels look alike.
 */
export function labelCodeFromNumber(target: LabelTarget, n: number): string {
  if (!Number.isInteger(n) || n < 0 || n >= LABEL_CODE_SPACE) throw new RangeError(`label number must be a whole number from 0 to ${LABEL_CODE_SPACE - 1}`);
  let body = '';
  let rest = n;
  for (let i = 0; i < LABEL_BODY_LENGTH; i++) {
    body = LABEL_ALPHABET[rest % LABEL_ALPHABET.length]! + body;
    rest = Math.floor(rest / LABEL_ALPHABET.length);
  }
  return `${LABEL_PREFIXES[target]}-${body}${luhnModNCheckCharacter(body, LABEL_ALPHABET)}`;
}

/** A read label code, or whether it was malformed or failed its check, in words. */
export type ParsedLabel =
  | { ok: true; target: LabelTarget; code: string }
  | { ok: false; reason: 'format' | 'check'; message: string };

/** Folds what people type for a look-alike back to the printed character. */
function foldLookAlikes(s: string): string {
  return s.replace(/O/g, '0').replace(/[IL]/g, '1');
}

// Any dash a keyboard or a copy-paste produces stands for the printed hyphen.
const LABEL_INPUT = /^([CL])[-\u2010-\u2015]?([0-9A-Z]{6})$/;

/**
 * Reads a typed or scanned label code: any case, with or without the hyphen or spaces, look-alikes
 * folded. Says whether it is malformed or fails its check, so the person knows to re-type it.
 */
export function parseLabelCode(raw: string): ParsedLabel {
  const squeezed = raw.trim().toUpperCase().replace(/\s+/g, '');
  const m = LABEL_INPUT.exec(squeezed);
  if (!m) return { ok: false, reason: 'format', message: 'A label code is C or L, then six letters and digits, for example C-7K3Q9G.' };
  const prefix = m[1]!;
  const rest = foldLookAlikes(m[2]!);
  if ([...rest].some((ch) => !LABEL_ALPHABET.includes(ch))) {
    return { ok: false, reason: 'format', message: 'That code has a letter labels never use (U); check it against the label.' };
  }
  if (!luhnModNValid(rest, LABEL_ALPHABET)) {
    return { ok: false, reason: 'check', message: 'That code does not check out: one character is probably misread. Check it against the label or scan the QR.' };
  }
  const target: LabelTarget = prefix === LABEL_PREFIXES.cast ? 'cast' : 'location';
  return { ok: true, target, code: `${prefix}-${rest}` };
}

/** Whether a typed or scanned code is a well-formed label code that passes its check. */
export function isValidLabelCode(raw: string): boolean {
  return parseLabelCode(raw).ok;
}

/** The URL a label's QR holds: the site's own origin, so a scan on the studio tablet opens the record directly. */
export function labelUrl(origin: string, code: string): string {
  return `${origin.replace(/\/+$/, '')}${LABEL_PATH}${encodeURIComponent(code)}`;
}

/**
 * The label code inside a scanned QR URL; null when the text is not a label URL. With
 * `expectedOrigin`, a label printed for another Plinth site is not taken as one of ours.
 */
export function labelCodeFromUrl(text: string, expectedOrigin?: string): ParsedLabel | null {
  let url: URL;
  try {
    url = new URL(text.trim());
  } catch {
    return null;
  }
  if (!url.pathname.startsWith(LABEL_PATH)) return null;
  if (expectedOrigin && url.origin !== new URL(expectedOrigin).origin) {
    return { ok: false, reason: 'format', message: 'This label was printed for a different site.' };
  }
  const segment = url.pathname.slice(LABEL_PATH.length).replace(/\/+$/, '');
  let decoded: string;
  try {
    decoded = decodeURIComponent(segment);
  } catch {
    return { ok: false, reason: 'format', message: 'This label URL is damaged; type the code printed under the QR instead.' };
  }
  return parseLabelCode(decoded);
}
