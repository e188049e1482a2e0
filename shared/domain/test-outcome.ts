/**
 * The outcome of one tested product from the codes recorded at its readings: strongest, final, and the
 * pattern across readings. The pattern is a hint for the lead; whether a reaction is allergic or irritant
 * is the clinician's call and is never inferred here.
 */
import { icdrgStrength, strongestCode, type GradedCode, type IcdrgCode } from './icdrg.ts';

/** How a reaction changed across readings, in Plinth's words; a hint, never a verdict. */
export const READING_PATTERNS = [
  'no_readings',
  'single_reading',
  'rising',
  'steady',
  'fading',
  'rising_then_fading',
  'fading_then_rising',
  'up_and_down',
] as const;
/** One pattern across readings. */
export type ReadingPattern = (typeof READING_PATTERNS)[number];

/** Patterns in plain words. */
export const READING_PATTERN_LABELS: Record<ReadingPattern, string> = {
  no_readings: 'No readings',
  single_reading: 'Single reading',
  rising: 'Rising',
  steady: 'Steady',
  fading: 'Fading',
  rising_then_fading: 'Rising, then fading',
  fading_then_rising: 'Fading, then rising',
  up_and_down: 'Up and down',
};

/** The name each pattern has in the dermatology literature, shown to the lead beside Plinth's word. */
export const READING_PATTERN_TERMS: Partial<Record<ReadingPattern, string>> = {
  rising: 'crescendo',
  steady: 'plateau',
  fading: 'decrescendo',
  rising_then_fading: 'crescendo–decrescendo',
  fading_then_rising: 'decrescendo–crescendo',
};

/** What each pattern tends to mean, worded as a hint for the lead. */
export const READING_PATTERN_HINTS: Partial<Record<ReadingPattern, string>> = {
  rising: 'Stronger at later readings. This is more typical of allergy.',
  steady: 'The same at each reading.',
  fading: 'Weaker at later readings. This is more typical of irritation or a false positive.',
  rising_then_fading: 'Stronger, then weaker again.',
  fading_then_rising: 'Weaker, then stronger again.',
  up_and_down: 'Changed direction more than once.',
};

/** One code recorded at one reading of one product. */
export interface GradedReading {
  readAt: Date;
  code: IcdrgCode;
}

/** What the readings of one tested product add up to. */
export interface ProductOutcome {
  /** Strongest code over the readings, `NT` ignored; null when none was graded. */
  strongest: GradedCode | null;
  /** Code at the last reading taken (by time), `NT` ignored. */
  final: GradedCode | null;
  finalAt: Date | null;
  pattern: ReadingPattern;
  /** Readings with a result, i.e. not `NT`. */
  gradedCount: number;
}

/**
 * The pattern of a run of codes in reading order: the direction of each change on the strength scale,
 * unchanged steps skipped. One direction is rising or fading, one turn names both, more turns are up and down.
 */
export function readingPattern(codes: readonly IcdrgCode[]): ReadingPattern {
  const ranks = codes.filter((c) => c !== 'NT').map(icdrgStrength);
  if (ranks.length === 0) return 'no_readings';
  if (ranks.length === 1) return 'single_reading';
  const turns: number[] = [];
  for (let i = 1; i < ranks.length; i++) {
    const step = Math.sign(ranks[i]! - ranks[i - 1]!);
    if (step !== 0 && step !== turns.at(-1)) turns.push(step);
  }
  if (turns.length === 0) return 'steady';
  if (turns.length === 1) return turns[0] === 1 ? 'rising' : 'fading';
  if (turns.length === 2) return turns[0] === 1 ? 'rising_then_fading' : 'fading_then_rising';
  return 'up_and_down';
}

/** Strongest, final and pattern for one product's readings, taken in time order whatever order they arrive in. */
export function productOutcome(readings: readonly GradedReading[]): ProductOutcome {
  const graded = readings.filter((r) => r.code !== 'NT').sort((a, b) => a.readAt.getTime() - b.readAt.getTime());
  const last = graded.at(-1);
  return {
    strongest: strongestCode(graded.map((r) => r.code)),
    final: (last?.code as GradedCode | undefined) ?? null,
    finalAt: last?.readAt ?? null,
    pattern: readingPattern(graded.map((r) => r.code)),
    gradedCount: graded.length,
  };
}
