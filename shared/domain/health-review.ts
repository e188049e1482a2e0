/** Which health answers the designated lead should look at. */
import type { ConsentKind } from './consent.ts';
import { isMedicalAnswer, type Question } from './questionnaire.ts';

/**
 * An answer needs the lead's look when it is a "yes" to a health question, or any free text written
 * in a health-data form: both may say something about the performer's health that staff must act on.
 */
export function needsLeadLook(formKind: ConsentKind, question: Pick<Question, 'type' | 'medical'>, answer: boolean | string | null): boolean {
  if (question.type === 'yes_no') return answer === true && isMedicalAnswer(formKind, question.medical);
  if (question.type === 'short_text') return formKind === 'health_data' && typeof answer === 'string' && answer.trim() !== '';
  return false;
}

/** Only answers given after the lead last confirmed having looked at this performer are new. */
export function isNewSince(signedAt: Date, reviewedAt: Date | null): boolean {
  return reviewedAt === null || signedAt.getTime() > reviewedAt.getTime();
}
