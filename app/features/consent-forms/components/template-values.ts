import type { Path } from 'react-hook-form';
import { z } from 'zod';
import { QUESTION_TYPES } from '#shared/domain/questionnaire.ts';
import { ConsentKindSchema, CreateTemplateInputSchema, type Template } from '#shared/schemas/consents.ts';

/** One question as typed: its options are one per line (choice questions only). */
const QuestionFormSchema = z.object({
  id: z.string(),
  type: z.enum(QUESTION_TYPES),
  label: z.string(),
  help: z.string(),
  options: z.string(),
  medical: z.boolean(),
  required: z.boolean(),
});

/** The form's own shape first (plain words for a bad number), then exactly the API's template schema. */
export const TemplateFormSchema = z
  .object({
    // "" until chosen, which the kind's own schema refuses with its words.
    kind: z.string().pipe(ConsentKindSchema),
    title: z.string(),
    body: z.string(),
    // As typed: "" means the consent runs until withdrawn.
    validityDays: z
      .string()
      .trim()
      .refine((v) => v === '' || /^\d+$/.test(v), 'Enter a whole number of days, or leave it empty'),
    questions: z.array(QuestionFormSchema),
  })
  .transform((v, ctx) => {
    const input = {
      kind: v.kind,
      title: v.title,
      body: v.body,
      validityDays: v.validityDays === '' ? null : Number(v.validityDays),
      questions: v.questions.map((q) => ({
        id: q.id.trim(),
        type: q.type,
        label: q.label,
        ...(q.help.trim() ? { help: q.help.trim() } : {}),
        ...(q.type === 'choice' ? { options: q.options.split('\n').map((o) => o.trim()).filter(Boolean) } : {}),
        medical: q.medical,
        required: q.required,
      })),
    };
    // Then exactly the API's rules, with their messages and paths ("questions.2.options").
    const checked = CreateTemplateInputSchema.safeParse(input);
    if (checked.success) return checked.data;
    for (const issue of checked.error.issues) ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path });
    return z.NEVER;
  });

/** The template form as typed. */
export type TemplateValues = z.input<typeof TemplateFormSchema>;

/** The form's values for a template, or blank ones for a new form. */
export function valuesOf(t: Template | undefined): TemplateValues {
  if (!t) return { kind: '', title: '', body: '', validityDays: '365', questions: [] };
  return {
    kind: t.kind,
    title: t.title,
    body: t.body,
    validityDays: t.validityDays === null ? '' : String(t.validityDays),
    questions: t.questions.map((q) => ({
      id: q.id,
      type: q.type,
      label: q.label,
      help: q.help ?? '',
      options: (q.options ?? []).join('\n'),
      medical: q.medical,
      required: q.required,
    })),
  };
}

/** Every field the API may name in its errors, for a form with this many questions. */
export function fieldNames(count: number): Path<TemplateValues>[] {
  const names: Path<TemplateValues>[] = ['kind', 'title', 'body', 'validityDays', 'questions'];
  for (let i = 0; i < count; i++) {
    for (const f of ['id', 'type', 'label', 'help', 'options', 'medical', 'required'] as const) names.push(`questions.${i}.${f}`);
  }
  return names;
}
