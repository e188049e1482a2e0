import { describe, expect, it } from 'vitest';
import { changedSinceCheck, endBeforeStart, opensIncident, SKIN_CHECK_OUTCOMES } from '#shared/domain/applications.ts';
import { checkVerdict } from '#shared/domain/check-verdict.ts';
import type { ClearanceResult, ClearanceState } from '#shared/domain/clearance.ts';

function result(id: string, state: ClearanceState): ClearanceResult {
  return { productId: `p-${id}`, formulationId: `f-${id}`, productName: `Product ${id}`, state, reasons: [], validUntil: null, retestAdvised: false, overridden: false, override: null, computedState: state };
}

describe('the skin check after removal', () => {
  it('opens an incident for anything but clear', () => {
    // common practice, no published source: any skin change after removal goes to the person who answers for health
    expect(SKIN_CHECK_OUTCOMES.filter(opensIncident)).toEqual(['redness', 'reaction']);
    expect(opensIncident('clear')).toBe(false);
  });
});

describe('application times', () => {
  it('refuses an end before the start, and allows an open end or the same minute', () => {
    const start = new Date('2026-12-02T07:00:00Z');
    expect(endBeforeStart(start, new Date('2026-12-02T06:59:00Z'))).toBe(true);
    expect(endBeforeStart(start, new Date('2026-12-02T07:00:00Z'))).toBe(false);
    expect(endBeforeStart(start, null)).toBe(false);
  });
});

describe('a check gone stale', () => {
  it('names the products whose answer is no longer what the check showed', () => {
    const checked = [
      { formulationId: 'f-a', productName: 'Product a', state: 'cleared' as const },
      { formulationId: 'f-b', productName: 'Product b', state: 'caution' as const },
      { formulationId: 'f-c', productName: 'Product c', state: 'cleared' as const },
    ];
    // b is now Do not use; c has a new formulation, so its checked one has no answer at all.
    const fresh = [result('a', 'cleared'), result('b', 'do_not_use'), result('c2', 'cleared')];
    expect(changedSinceCheck(checked, fresh).map((c) => c.formulationId)).toEqual(['f-b', 'f-c']);
    expect(changedSinceCheck(checked, [result('a', 'cleared'), result('b', 'caution'), result('c', 'cleared')])).toEqual([]);
  });
  it('a lead-approved Caution still goes; a Do not use approved the same way does not', () => {
    // Product brief (product.md §2 workflow 4 and the issue): go only when every product is Cleared or a Caution the lead approved.
    expect(checkVerdict([result('a', 'caution')], [{ formulationId: 'f-a' }]).verdict).toBe('go');
    expect(checkVerdict([result('a', 'do_not_use')], [{ formulationId: 'f-a' }]).verdict).toBe('stop');
  });
});
