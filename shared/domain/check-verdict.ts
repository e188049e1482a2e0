/** The artist's check before an application: one go or stop over the products planned for today. */
import { CLEARANCE_STATE_LABELS, type ClearanceResult } from './clearance.ts';

/** The lead's approval to use a Caution formulation on this performer; the caller passes those in force. */
export interface CautionApproval {
  formulationId: string;
}

/** One planned product in the check, with whether it lets the application go ahead. */
export interface VerdictItem {
  result: ClearanceResult;
  /** A Caution the lead has approved for this performer. */
  approved: boolean;
  go: boolean;
}

/** The whole check: go or stop, and which products hold it up. */
export interface CheckVerdict {
  verdict: 'go' | 'stop';
  items: VerdictItem[];
  /** The products that stop the application, in the order they were chosen. */
  holdingUp: ClearanceResult[];
  message: string;
}

function listNames(results: readonly ClearanceResult[]): string {
  return results.map((r) => `${r.productName} (${CLEARANCE_STATE_LABELS[r.state]})`).join(', ');
}

/**
 * Go only when every planned product is Cleared or a Caution the lead approved for this performer;
 * anything else, or nothing chosen, is stop. A stop names each product that holds it up.
 */
export function checkVerdict(items: readonly ClearanceResult[], approvals: readonly CautionApproval[]): CheckVerdict {
  const approvedIds = new Set(approvals.map((a) => a.formulationId));
  const judged = items.map((result) => {
    const approved = result.state === 'caution' && approvedIds.has(result.formulationId);
    return { result, approved, go: result.state === 'cleared' || approved };
  });
  const holdingUp = judged.filter((i) => !i.go).map((i) => i.result);
  if (items.length === 0) return { verdict: 'stop', items: judged, holdingUp, message: 'Choose the products planned for today.' };
  if (holdingUp.length > 0) {
    const n = holdingUp.length;
    return { verdict: 'stop', items: judged, holdingUp, message: `Stop: ${n} product${n === 1 ? ' holds' : 's hold'} this up: ${listNames(holdingUp)}.` };
  }
  const anyApproved = judged.some((i) => i.approved);
  return {
    verdict: 'go',
    items: judged,
    holdingUp,
    message: anyApproved ? 'Go: every product is cleared or approved by the designated lead.' : 'Go: every product is cleared.',
  };
}
