import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useDeferredValue, useState } from 'react';
import { useFieldArray, useForm, useWatch, type Control, type FieldErrors, type Path, type Resolver, type UseFormRegister, type UseFormSetValue } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import { z } from 'zod';
import { CONSENT_KINDS, CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { QUESTION_TYPES, type QuestionType } from '#shared/domain/questionnaire.ts';
import { ConsentKindSchema, CreateTemplateInputSchema, type CreateTemplateInput, type Template } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { paths } from '../../../lib/paths.ts';
import { ConsentText } from '../../../components/consent/consent-text.tsx';
import { templateQueryOptions, useCreateTemplate, usePublishTemplate } from '../api.ts';

const QUESTION_TYPE_LABELS: Record<QuestionType, string> = { yes_no: 'Yes or no', short_text: 'Short text', choice: 'Choice of options' };

interface QuestionValues {
  id: string;
  type: QuestionType;
  label: string;
  help: string;
  /** One option per line (choice questions only). */
  options: string;
  medical: boolean;
  required: boolean;
}

interface TemplateValues {
  kind: string;
  title: string;
  body: string;
  /** As typed: "" means the consent runs until withdrawn. */
  validityDays: string;
  questions: QuestionValues[];
}

/** The form's own shape first (plain words for a bad number), then exactly the API's template schema. */
const TemplateFormSchema = z
  .object({
    kind: ConsentKindSchema,
    title: z.string(),
    body: z.string(),
    validityDays: z
      .string()
      .trim()
      .refine((v) => v === '' || /^\d+$/.test(v), 'Enter a whole number of days, or leave it empty'),
    questions: z.array(
      z.object({ id: z.string(), type: z.enum(QUESTION_TYPES), label: z.string(), help: z.string(), options: z.string(), medical: z.boolean(), required: z.boolean() }),
    ),
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

function valuesOf(t: Template | undefined): TemplateValues {
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

function fieldNames(count: number): Path<TemplateValues>[] {
  const names: Path<TemplateValues>[] = ['kind', 'title', 'body', 'validityDays', 'questions'];
  for (let i = 0; i < count; i++) {
    for (const f of ['id', 'type', 'label', 'help', 'options', 'medical', 'required'] as const) names.push(`questions.${i}.${f}`);
  }
  return names;
}

/** "Known allergies?" → "known_allergies": a first id for a new question, from its label. */
function slugOf(label: string): string {
  return label
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .slice(0, 40);
}

/** Writes a new consent form, or publishes a new version of one (signed consents keep theirs). */
export function TemplateEditor({ template }: { template?: Template }) {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const create = useCreateTemplate();
  const publish = usePublishTemplate(template?.id ?? '');
  const [base, setBase] = useState(template);
  const [conflict, setConflict] = useState<unknown>(null);
  const [reloading, setReloading] = useState(false);
  const [reloadError, setReloadError] = useState<unknown>(null);
  const [formError, setFormError] = useState<string[] | null>(null);
  const [published, setPublished] = useState<number | null>(null);
  const form = useForm<TemplateValues, unknown, CreateTemplateInput>({
    // The kind is "" until chosen, which the schema refuses with its own words; the form type allows it.
    resolver: zodResolver(TemplateFormSchema) as unknown as Resolver<TemplateValues, unknown, CreateTemplateInput>,
    defaultValues: valuesOf(template),
  });
  const { errors, isSubmitting, isDirty } = form.formState;
  const questions = useFieldArray({ control: form.control, name: 'questions' });
  const body = useDeferredValue(useWatch({ control: form.control, name: 'body' }));

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setConflict(null);
    setPublished(null);
    try {
      if (!base) {
        const created = await create.mutateAsync(values);
        void navigate(paths.consentForm.href(created.id), { replace: true });
        return;
      }
      const fresh = await publish.mutateAsync({ ...values, version: base.version });
      setBase(fresh);
      form.reset(valuesOf(fresh));
      setPublished(fresh.version);
    } catch (err) {
      if (isApiError(err, 409)) return setConflict(err);
      setFormError(formErrorsFrom(err, form.setError, fieldNames(values.questions.length)));
    }
  });

  async function reload() {
    if (!base) return;
    setReloading(true);
    setReloadError(null);
    try {
      const fresh = await queryClient.fetchQuery({ ...templateQueryOptions(base.id), staleTime: 0 });
      setBase(fresh);
      form.reset(valuesOf(fresh));
      setConflict(null);
    } catch (err) {
      setReloadError(err);
    } finally {
      setReloading(false);
    }
  }

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-6" aria-label={base ? 'Edit consent form' : 'New consent form'} data-testid="template-editor">
      <Section title="The form">
        <div className="grid gap-4 md:grid-cols-3">
          <SelectField label="Kind" error={errors.kind?.message} {...form.register('kind')}>
            <option value="">Choose a kind…</option>
            {CONSENT_KINDS.map((k) => (
              <option key={k} value={k}>
                {CONSENT_KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
          <TextField label="Title" autoComplete="off" className="md:col-span-2" error={errors.title?.message} {...form.register('title')} />
          <TextField
            label="Valid for (days)"
            type="number"
            inputMode="numeric"
            min={1}
            max={3650}
            hint="Leave empty for a consent that runs until withdrawn."
            error={errors.validityDays?.message}
            {...form.register('validityDays')}
          />
        </div>
        <div className="grid gap-4 lg:grid-cols-2">
          <TextareaField
            label="Consent text"
            hint="Markdown: ## for a heading, - for a list item, **bold**. The performer reads exactly this."
            rows={18}
            mono
            error={errors.body?.message}
            {...form.register('body')}
          />
          <section aria-labelledby="template-preview-label" className="flex flex-col gap-1">
            <h3 className="text-sm font-semibold text-ink-900" id="template-preview-label">
              Preview
            </h3>
            <div className="min-h-40 rounded-lg border border-sand-300 bg-sand-50 p-4" data-testid="template-preview">
              {body.trim() ? <ConsentText body={body} headingLevel={4} /> : <p className="text-ink-600">The text appears here as the performer will see it.</p>}
            </div>
          </section>
        </div>
      </Section>

      <Section
        title="Questions"
        actions={
          <Button variant="secondary" onClick={() => questions.append({ id: '', type: 'yes_no', label: '', help: '', options: '', medical: false, required: true })} data-testid="add-question">
            Add a question
          </Button>
        }
      >
        <p className="max-w-prose text-ink-700">
          Asked after the text, before signing. Mark a question “Health detail” when its answer is health information: only the designated lead and the performer will see it.
        </p>
        {errors.questions?.message || errors.questions?.root?.message ? (
          <p className="text-sm font-semibold text-brick-700">{errors.questions.message ?? errors.questions.root?.message}</p>
        ) : null}
        {questions.fields.length === 0 ? <p className="text-ink-700">No questions: the performer reads the text and signs.</p> : null}
        <ol className="flex flex-col gap-4">
          {questions.fields.map((field, i) => (
            <li key={field.id}>
              <QuestionEditor
                index={i}
                count={questions.fields.length}
                control={form.control}
                register={form.register}
                setValue={form.setValue}
                errors={errors}
                onMove={(to) => questions.move(i, to)}
                onRemove={() => questions.remove(i)}
              />
            </li>
          ))}
        </ol>
      </Section>

      {conflict ? <ConflictNotice error={conflict} onReload={() => void reload()} reloading={reloading} /> : null}
      {reloadError ? <ErrorBanner error={reloadError} /> : null}
      <FormError messages={formError} />
      <div className="flex flex-col gap-2">
        {base ? (
          <p className="text-ink-700">
            Saving publishes version {base.version + 1}. Signed consents keep the version they were signed on; open requests show the new version.
          </p>
        ) : null}
        <div className="flex flex-wrap items-center gap-4">
          <Button type="submit" pending={isSubmitting} pendingLabel={base ? 'Publishing…' : 'Creating…'} disabled={conflict !== null || (base !== undefined && !isDirty)}>
            {base ? `Publish version ${base.version + 1}` : 'Create the form'}
          </Button>
          {published !== null && !isDirty ? <output className="font-semibold text-sage-800">Published version {published}.</output> : null}
        </div>
      </div>
    </form>
  );
}

interface QuestionEditorProps {
  index: number;
  count: number;
  control: Control<TemplateValues, unknown, CreateTemplateInput>;
  register: UseFormRegister<TemplateValues>;
  setValue: UseFormSetValue<TemplateValues>;
  errors: FieldErrors<TemplateValues>;
  onMove: (to: number) => void;
  onRemove: () => void;
}

function QuestionEditor({ index: i, count, control, register, setValue, errors, onMove, onRemove }: QuestionEditorProps) {
  const type = useWatch({ control, name: `questions.${i}.type` });
  const id = useWatch({ control, name: `questions.${i}.id` });
  // Every answer to a health-data form is a health detail; the server stores it so whatever is sent.
  const healthForm = useWatch({ control, name: 'kind' }) === 'health_data';
  const e = errors.questions?.[i];
  const n = i + 1;
  return (
    <fieldset className="flex flex-col gap-4 rounded-xl border border-sand-300 p-4" data-testid="question-editor">
      <legend className="px-1 font-bold text-ink-900">Question {n}</legend>
      <div className="grid gap-4 md:grid-cols-3">
        <TextareaField
          label="Question text"
          rows={2}
          className="md:col-span-2"
          error={e?.label?.message}
          {...register(`questions.${i}.label`, {
            onBlur: (ev: React.FocusEvent<HTMLTextAreaElement>) => {
              if (!id) setValue(`questions.${i}.id`, slugOf(ev.target.value), { shouldDirty: true });
            },
          })}
        />
        <SelectField label="Answer" error={e?.type?.message} {...register(`questions.${i}.type`)}>
          {QUESTION_TYPES.map((t) => (
            <option key={t} value={t}>
              {QUESTION_TYPE_LABELS[t]}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Id"
          autoComplete="off"
          hint="Lower-case letters, digits and _. Names the answer on the record."
          error={e?.id?.message}
          {...register(`questions.${i}.id`)}
        />
        <TextField label="Help (optional)" autoComplete="off" className="md:col-span-2" error={e?.help?.message} {...register(`questions.${i}.help`)} />
        {type === 'choice' ? (
          <TextareaField label="Options" hint="One per line; at least two." rows={4} className="md:col-span-3" error={e?.options?.message} {...register(`questions.${i}.options`)} />
        ) : null}
      </div>
      <div className="flex flex-wrap gap-x-6">
        <CheckboxField label="Required" error={e?.required?.message} {...register(`questions.${i}.required`)} />
        {healthForm ? (
          <p className="flex min-h-11 items-center text-sm font-semibold text-ink-800">Health detail: always, on a health-data form.</p>
        ) : (
          <CheckboxField
            label="Health detail"
            hint="Seen only by the designated lead and the performer. Once published, only a designated lead can turn this off."
            error={e?.medical?.message}
            {...register(`questions.${i}.medical`)}
          />
        )}
      </div>
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" disabled={i === 0} onClick={() => onMove(i - 1)} aria-label={`Move question ${n} up`}>
          <span aria-hidden="true">↑</span> Up
        </Button>
        <Button variant="secondary" disabled={i === count - 1} onClick={() => onMove(i + 1)} aria-label={`Move question ${n} down`}>
          <span aria-hidden="true">↓</span> Down
        </Button>
        <Button variant="quiet" onClick={onRemove} aria-label={`Remove question ${n}`}>
          Remove
        </Button>
      </div>
    </fieldset>
  );
}
