import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useDeferredValue, useState } from 'react';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { CONSENT_KINDS, CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { Template } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
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
import { QuestionEditor } from './question-editor.tsx';
import { TemplateFormSchema, fieldNames, valuesOf } from './template-values.ts';

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
  const form = useForm<z.input<typeof TemplateFormSchema>, unknown, z.output<typeof TemplateFormSchema>>({
    resolver: zodResolver(TemplateFormSchema),
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
