import { describe, expect, it } from 'vitest';
import { checkVerdict } from '#shared/domain/check-verdict.ts';
import type { ClearanceResult, ClearanceState } from '#shared/domain/clearance.ts';

function result(id: string, state: ClearanceState): ClearanceResult {
  return {
    productId: `p-${id}`,
    formulationId: `f-${id}`,
    productName: `Product ${id.toUpperCase()}`,
    state,
    reasons: [],
    validUntil: null,
    retestAdvised: false,
    overridden: false,
    override: null,
    computedState: state,
  };
}

describe('checkVerdict', () => {
  it('is go when every product is cleared', () => {
    const v = checkVerdict([result('a', 'cleared'), result('b', 'cleared')], []);
    expect(v.verdict).toBe('go');
    expect(v.holdingUp).toEqual([]);
    expect(v.message).toBe('Go: every product is cleared.');
  });

  it('stops on a Caution the lead has not approved, and names it', () => {
    const v = checkVerdict([result('a', 'cleared'), result('b', 'caution')], []);
    expect(v.verdict).toBe('stop');
    expect(v.holdingUp.map((r) => r.productId)).toEqual(['p-b']);
    expect(v.message).toBe('Stop: 1 product holds this up: Product B (Caution).');
  });

  it('goes on a Caution the lead approved for this performer', () => {
    const v = checkVerdict([result('a', 'cleared'), result('b', 'caution')], [{ formulationId: 'f-b' }]);
    expect(v.verdict).toBe('go');
    expect(v.items.map((i) => i.approved)).toEqual([false, true]);
    expect(v.message).toMatch(/approved by the designated lead/);
  });

  it('never lets an approval wave through anything but Caution', () => {
    for (const state of ['do_not_use', 'pending', 'untested'] as const) {
      const v = checkVerdict([result('a', state)], [{ formulationId: 'f-a' }]);
      expect(v.verdict, state).toBe('stop');
      expect(v.items[0]!.approved).toBe(false);
    }
  });

  it('lists every product that holds it up, in the order chosen', () => {
    const v = checkVerdict([result('a', 'untested'), result('b', 'cleared'), result('c', 'do_not_use'), result('d', 'pending')], []);
    expect(v.holdingUp.map((r) => r.productId)).toEqual(['p-a', 'p-c', 'p-d']);
    expect(v.message).toBe('Stop: 3 products hold this up: Product A (Untested), Product C (Do not use), Product D (Pending).');
  });

  it('reads the state after an override', () => {
    const overridden = { ...result('a', 'cleared'), computedState: 'caution' as const, overridden: true };
    expect(checkVerdict([overridden], []).verdict).toBe('go');
  });

  it('is stop when nothing was chosen', () => {
    const v = checkVerdict([], []);
    expect(v.verdict).toBe('stop');
    expect(v.message).toBe('Choose the products planned for today.');
  });
});
