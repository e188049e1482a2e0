/**
 * The named positions a product can be put on for a test: numbered places on the inner forearms and
 * upper back, and behind each ear. One product per site on a test.
 */
const numbered = (name: string, n: number) => Array.from({ length: n }, (_, i) => `${name} ${i + 1}`);

// common practice, no published source: inner forearm, upper back and behind the ear are the usual department test places.
export const TEST_SITES = [
  ...numbered('Left inner forearm', 6),
  ...numbered('Right inner forearm', 6),
  ...numbered('Upper back, left', 5),
  ...numbered('Upper back, right', 5),
  'Behind the left ear',
  'Behind the right ear',
] as const;
export type TestSite = (typeof TEST_SITES)[number];

/** Sites both lists name. */
export function sharedSites(a: readonly string[], b: readonly string[]): string[] {
  const inB = new Set(b);
  return a.filter((s) => inB.has(s));
}

/** Whether two spans of time overlap (end exclusive). */
export function spansOverlap(a: { from: Date; to: Date }, b: { from: Date; to: Date }): boolean {
  return a.from.getTime() < b.to.getTime() && b.from.getTime() < a.to.getTime();
}
