/**
 * The ICDRG reading scale: the closed list of codes a reader records at each reading, stored as the symbol.
 *
 * Strength order, weakest first: `NT` (no result) < `-` < `?+` < `IR` < `+` < `++` < `+++`.
 * `?+` is faint erythema only, the least visible reaction. `IR` is a visible reaction the reader judged to be
 * irritant; it ranks above a doubtful reading and below `+`. A `+` needs infiltration, and it is where a
 * product becomes Do not use. The order therefore follows clearance severity: `+` and stronger give Do not use,
 * `IR` and `?+` give Caution, `-` can clear. `IR` is only the reader's call: Plinth never turns it, or any other
 * grade, into a diagnosis.
 */

export const ICDRG_CODES = ['-', '?+', '+', '++', '+++', 'IR', 'NT'] as const;
/** A code on the ICDRG scale, stored as its symbol. */
export type IcdrgCode = (typeof ICDRG_CODES)[number];

/** The codes that count as a result at a site: everything except "not tested". */
export type GradedCode = Exclude<IcdrgCode, 'NT'>;

/** Each code in plain words, for the lead and the performer. */
export const ICDRG_LABELS: Record<IcdrgCode, string> = {
  '-': 'Negative',
  '?+': 'Doubtful',
  '+': 'Weak positive',
  '++': 'Strong positive',
  '+++': 'Extreme positive',
  IR: 'Irritant reaction',
  NT: 'Not tested',
};

/** What the reader sees at the site for each code, without diagnosing anything. */
export const ICDRG_DESCRIPTIONS: Record<IcdrgCode, string> = {
  '-': 'No reaction.',
  '?+': 'Faint redness only.',
  '+': 'Redness with raised, firm skin (infiltration); possibly small bumps.',
  '++': 'Redness, raised firm skin, small bumps and small blisters.',
  '+++': 'Intense redness and swelling with blisters running together.',
  IR: 'A reaction the reader judges to be irritation, for example redness without raised skin limited to the patch.',
  NT: 'This site was not read (for example the patch came off).',
};

const STRENGTH: Record<IcdrgCode, number> = { NT: 0, '-': 1, '?+': 2, IR: 3, '+': 4, '++': 5, '+++': 6 };

/** Rank of a code on the strength scale above; `NT` ranks lowest because it carries no result. */
export function icdrgStrength(code: IcdrgCode): number {
  return STRENGTH[code];
}

/** The strongest code among those given, ignoring `NT`; null when nothing was graded. */
export function strongestCode(codes: readonly IcdrgCode[]): GradedCode | null {
  let best: GradedCode | null = null;
  for (const c of codes) {
    if (c === 'NT') continue;
    if (best === null || STRENGTH[c] > STRENGTH[best]) best = c;
  }
  return best;
}

/** `+`, `++` and `+++` are positive; `?+` is doubtful, not positive. */
export function isPositive(code: IcdrgCode): boolean {
  return code === '+' || code === '++' || code === '+++';
}

/** A reading that is neither negative nor positive but still asks for care: doubtful or irritant. */
export function isDoubtfulOrIrritant(code: IcdrgCode): boolean {
  return code === '?+' || code === 'IR';
}

const NUMERIC: Partial<Record<IcdrgCode, number>> = { '-': 0, '?+': 0.5, '+': 1, '++': 2, '+++': 3 };

/**
 * The numeric view some papers use (doubtful 0.5, + 1, ++ 2, +++ 3; negative 0). Derived only, never stored;
 * `IR` and `NT` have no number because they are not steps on the allergic scale.
 */
export function icdrgScore(code: IcdrgCode): number | null {
  return NUMERIC[code] ?? null;
}

const SYNONYMS: Record<string, IcdrgCode> = {
  '-': '-',
  '?+': '?+',
  '+?': '?+',
  '±': '?+',
  '+': '+',
  '++': '++',
  '+++': '+++',
  IR: 'IR',
  NT: 'NT',
};

/**
 * Reads a typed or imported code: trims, folds case, treats `+?` and `±` as `?+`, and a typographic minus or
 * dash as `-`. Anything off the closed list is null, so a caller can refuse it by name.
 */
export function normaliseIcdrgCode(input: string): IcdrgCode | null {
  const s = input
    .normalize('NFKC')
    .replace(/\s+/g, '')
    .replace(/[\u2212\u2012\u2013\u2014\u2010\u2011]/g, '-')
    .toUpperCase();
  return SYNONYMS[s] ?? null;
}
