import { z } from 'zod';

export const QUESTION_TYPES = ['yes_no', 'short_text', 'choice'] as const;
export type QuestionType = (typeof QUESTION_TYPES)[number];

export const QuestionSchema = z
  .object({
    id: z.string().regex(/^[a-z0-9_]{1,40}$/, 'Use lower-case letters, digits and _ (at most 40)'),
    type: z.enum(QUESTION_TYPES),
    label: z.string().trim().min(1, 'Enter the question').max(300),
    help: z.string().trim().max(500).optional(),
    options: z.array(z.string().trim().min(1).max(120)).max(20).optional(),
    medical: z.boolean(),
    required: z.boolean(),
  })
  .refine((q) => q.type !== 'choice' || (q.options?.length ?? 0) >= 2, { message: 'A choice needs at least two options', path: ['options'] });
export type Question = z.infer<typeof QuestionSchema>;

export const QuestionsSchema = z
  .array(QuestionSchema)
  .max(40)
  .refine((qs) => new Set(qs.map((q) => q.id)).size === qs.length, { message: 'Each question needs its own id' });

export type AnswerValue = boolean | string;
export type Answers = Record<string, AnswerValue | undefined>;

/**
 * The answers schema for one questionnaire, shared by the signing screen and the server:
 * yes/no is a boolean, short text a string, a choice one of its options; required ones must be given.
 */
export function answersSchemaFor(questions: readonly Question[]) {
  // Typed by value, so the signing form's answers read as `Answers` without a cast.
  const shape: Record<string, z.ZodType<AnswerValue | undefined, AnswerValue | undefined>> = {};
  for (const q of questions) {
    let s: z.ZodType<AnswerValue, AnswerValue>;
    if (q.type === 'yes_no') s = z.boolean({ message: 'Answer yes or no' });
    else if (q.type === 'choice') s = z.enum(q.options as [string, ...string[]], { message: 'Choose one of the options' });
    else s = q.required ? z.string().trim().min(1, 'This answer is required').max(1000) : z.string().trim().max(1000);
    shape[q.id] = q.required ? s : s.optional();
  }
  return z.strictObject(shape, { message: 'Answer the questions on the form only' });
}

/** Words for an optional question left blank: the performer declared nothing there. */
export const NO_ANSWER_WORDS = 'None declared';

/** Human words for an answer, for the PDF and the record page. */
export function formatAnswer(q: Pick<Question, 'type'>, value: AnswerValue | undefined): string {
  if (value === undefined || value === '') return NO_ANSWER_WORDS;
  if (q.type === 'yes_no') return value === true ? 'Yes' : 'No';
  return String(value);
}

/** Every answer to a health-data form is a health detail, whatever a question's flag says. */
export function isMedicalAnswer(formKind: string, flaggedMedical: boolean): boolean {
  return flaggedMedical || formKind === 'health_data';
}

/** Questions of a form as they will be stored: on a health-data form each one is medical. */
export function withMedicalFlags<Q extends { medical: boolean }>(formKind: string, questions: readonly Q[]): Q[] {
  return questions.map((q) => ({ ...q, medical: isMedicalAnswer(formKind, q.medical) }));
}

/** Question ids that were medical in the earlier version and are not in the next one's flags. */
export function questionsLosingMedicalFlag(before: readonly { id: string; medical: boolean }[], after: readonly { id: string; medical: boolean }[]): string[] {
  const next = new Map(after.map((q) => [q.id, q.medical]));
  return before.filter((q) => q.medical && next.get(q.id) === false).map((q) => q.id);
}
