import { zodResolver } from '@hookform/resolvers/zod';
import { useId, useMemo, useRef, useState } from 'react';
import { useController, useForm, useWatch, type Control, type Path, type Resolver } from 'react-hook-form';
import { z } from 'zod';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { answersSchemaFor, type Question } from '#shared/domain/questionnaire.ts';
import { SubmitSignatureInputSchema, type SigningForm, type SubmitSignatureInput } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { describedBy } from '../../../components/ui/field.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Caution } from '../../../components/consent/caution.tsx';
import { ConsentText } from '../../../components/consent/consent-text.tsx';
import { SignatureField } from './signature-field.tsx';
import { AnswerProgress, MissingSummary, partLabel, type MissingItem } from './signing-progress.tsx';

export interface SigningValues {
  answers: Record<string, boolean | string | undefined>;
  signerName: string;
  agreed: boolean;
  signaturePng: string;
}

export type SubmitResult = { consentId: string; signedAt: string; emailedTo: string | null; duplicate: boolean };

interface SigningFormProps {
  form: SigningForm;
  /** One per form shown: a double tap or a retry sends the same key, and the server makes one consent. */
  idempotencyKey: string;
  /** 'tablet': the department's tablet, lent to the performer; 'link': the performer's own device. */
  mode: 'tablet' | 'link';
  submit: (input: SubmitSignatureInput) => Promise<SubmitResult>;
  onSigned: (result: SubmitResult) => void;
  /** The tablet only: "I don't want to sign now". */
  decline?: () => Promise<unknown>;
  onDeclined?: () => void;
}

const AGREE_MESSAGE = {
  tablet: 'Tick the box to agree. If you do not agree, choose “I don’t want to sign now” and hand the tablet back.',
  link: 'Tick the box to agree. If you do not agree, you do not need to sign: you can close this page.',
} as const;

/** The client's check: the very answers schema the server applies, plus the signing fields' own rules. */
function signingSchema(questions: readonly Question[], mode: 'tablet' | 'link') {
  return z.object({
    answers: answersSchemaFor(questions),
    signerName: SubmitSignatureInputSchema.shape.signerName,
    agreed: z.boolean().refine((v) => v, { message: AGREE_MESSAGE[mode] }),
    signaturePng: SubmitSignatureInputSchema.shape.signaturePng,
  });
}

/** Unanswered optional questions are left out rather than sent empty. */
function answered(answers: SigningValues['answers']): Record<string, boolean | string> {
  const out: Record<string, boolean | string> = {};
  for (const [k, v] of Object.entries(answers)) if (v !== undefined && v !== '') out[k] = typeof v === 'string' ? v.trim() : v;
  return out;
}

/**
 * The one signing form, for the lent tablet and for a one-time link: the exact text, the
 * questionnaire, the printed name, the agreement (never pre-ticked) and a finger signature.
 */
export function SigningFormView({ form: signing, idempotencyKey, mode, submit, onSigned, decline, onDeclined }: SigningFormProps) {
  const { template } = signing;
  const schema = useMemo(() => signingSchema(template.questions, mode), [template.questions, mode]);
  const form = useForm<SigningValues>({
    resolver: zodResolver(schema) as unknown as Resolver<SigningValues>,
    // The signature pad registers first; focus goes to the first missing answer in the form's order instead.
    shouldFocusError: false,
    defaultValues: {
      answers: Object.fromEntries(template.questions.map((q) => [q.id, q.type === 'short_text' ? '' : undefined])),
      signerName: '',
      agreed: false,
      signaturePng: '',
    },
  });
  const { errors, isSubmitting } = form.formState;
  const [formError, setFormError] = useState<string[] | null>(null);
  const [confirmDecline, setConfirmDecline] = useState(false);
  const [declining, setDeclining] = useState(false);
  const [declineError, setDeclineError] = useState<unknown>(null);
  const sending = useRef(false);
  const signature = useController({ control: form.control, name: 'signaturePng' });

  const fieldNames = useMemo(
    () => ['signerName', 'agreed', 'signaturePng', 'answers', ...template.questions.map((q) => `answers.${q.id}`)] as Path<SigningValues>[],
    [template.questions],
  );

  // A second tap while the first is on its way sends nothing (and would reuse the key if it did).
  async function send(values: SigningValues) {
    if (sending.current) return;
    sending.current = true;
    setFormError(null);
    try {
      const result = await submit({
        templateVersionId: template.versionId,
        idempotencyKey,
        signerName: values.signerName.trim(),
        agreed: true,
        answers: answered(values.answers),
        signaturePng: values.signaturePng,
      });
      onSigned(result);
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, fieldNames));
    } finally {
      sending.current = false;
    }
  }

  async function onDecline() {
    if (!decline) return;
    setDeclining(true);
    setDeclineError(null);
    try {
      await decline();
      setConfirmDecline(false);
      onDeclined?.();
    } catch (err) {
      setDeclineError(err);
    } finally {
      setDeclining(false);
    }
  }

  const agreeId = useId();
  const parts = template.questions.length ? 3 : 2;
  const answers = useWatch({ control: form.control, name: 'answers' });
  const answeredCount = template.questions.filter((q) => answers[q.id] !== undefined && answers[q.id] !== '').length;
  // In the form's order: the questions, then name, agreement and signature.
  const missing: MissingItem[] =
    form.formState.submitCount > 0
      ? [
          ...template.questions.flatMap((q) => {
            const message = errors.answers?.[q.id]?.message;
            return message ? [{ name: `answers.${q.id}`, label: q.label, message }] : [];
          }),
          ...(errors.signerName?.message ? [{ name: 'signerName', label: 'Your full name', message: errors.signerName.message }] : []),
          ...(errors.agreed?.message ? [{ name: 'agreed', label: 'Agreement', message: 'Tick the box to agree' }] : []),
          ...(errors.signaturePng?.message ? [{ name: 'signaturePng', label: 'Signature', message: errors.signaturePng.message }] : []),
        ]
      : [];
  const goTo = (name: string) => form.setFocus(name as Path<SigningValues>);
  function focusFirstMissing(invalid: typeof errors) {
    const first = [
      ...template.questions.filter((q) => invalid.answers?.[q.id]).map((q) => `answers.${q.id}`),
      ...(['signerName', 'agreed', 'signaturePng'] as const).filter((n) => invalid[n]),
    ][0];
    if (first) goTo(first);
  }

  return (
    <form noValidate onSubmit={(e) => void form.handleSubmit(send, focusFirstMissing)(e)} className="flex flex-col gap-8 text-lg" aria-label={template.title} data-testid="signing-form">
      <header className="flex flex-col gap-2">
        <p className="text-lg font-semibold text-ink-700">
          {CONSENT_KIND_LABELS[template.kind]} · version {template.version}
          {signing.productionName ? ` · ${signing.productionName}` : ''}
        </p>
        <h1 className="text-3xl font-bold text-ink-900 sm:text-4xl" data-testid="signing-title">
          {template.title}
        </h1>
        <p className="text-xl text-ink-900">
          For <span className="font-bold" data-testid="signing-performer">{signing.performerName}</span>
        </p>
        {mode === 'link' ? (
          <p className="text-ink-700">
            This link works until <time dateTime={signing.expiresAt}>{formatDateTime(signing.expiresAt)}</time>. You are free not to sign.
          </p>
        ) : (
          <p className="text-ink-700">Read the form, answer the questions and sign at the end. You are free not to sign.</p>
        )}
      </header>

      <MissingSummary items={missing} onGo={goTo} />

      <section aria-labelledby={`${agreeId}-text`} className="flex flex-col gap-3 rounded-2xl border border-sand-300 bg-white p-5 sm:p-8">
        <h2 id={`${agreeId}-text`} className="text-lg font-semibold text-ink-700">
          {partLabel(1, parts)} · Read the form
        </h2>
        <ConsentText body={template.body} headingLevel={3} large testId="signing-text" />
      </section>

      {template.questions.length ? (
        <section aria-labelledby={`${agreeId}-questions`} className="flex flex-col gap-6">
          <h2 id={`${agreeId}-questions`} className="text-2xl font-bold text-ink-900">
            <span className="block text-lg font-semibold text-ink-700">{partLabel(2, parts)}</span>
            Your answers
          </h2>
          <AnswerProgress answered={answeredCount} total={template.questions.length} />
          {template.questions.map((q) => (
            <QuestionField key={q.id} question={q} control={form.control} error={errors.answers?.[q.id]?.message} disabled={isSubmitting} />
          ))}
        </section>
      ) : null}

      <section aria-labelledby={`${agreeId}-sign`} className="flex flex-col gap-6">
        <h2 id={`${agreeId}-sign`} className="text-2xl font-bold text-ink-900">
          <span className="block text-lg font-semibold text-ink-700">{partLabel(parts, parts)}</span>
          Agree and sign
        </h2>
        <BigTextField
          label="Your full name"
          hint="Print your name as you sign it."
          error={errors.signerName?.message}
          disabled={isSubmitting}
          autoComplete="off"
          {...form.register('signerName')}
        />
        <div className="flex flex-col gap-1">
          <label htmlFor={`${agreeId}-agree`} className="inline-flex min-h-14 cursor-pointer items-center gap-4 rounded-xl border-2 border-ink-500 bg-white px-4 py-3 text-xl font-semibold text-ink-900 has-checked:border-clay-700 has-checked:bg-clay-50">
            <input
              id={`${agreeId}-agree`}
              type="checkbox"
              className="size-8 shrink-0 cursor-pointer accent-clay-700"
              aria-invalid={errors.agreed ? true : undefined}
              aria-describedby={errors.agreed ? `${agreeId}-agree-error` : undefined}
              disabled={isSubmitting}
              data-testid="agree-checkbox"
              {...form.register('agreed')}
            />
            <span>I have read this and I agree</span>
          </label>
          {errors.agreed?.message ? <ErrorLine id={`${agreeId}-agree-error`} message={errors.agreed.message} /> : null}
        </div>

        <Caution kind={template.kind} large />

        <SignatureField
          onChange={(v) => {
            signature.field.onChange(v);
            if (v) form.clearErrors('signaturePng');
          }}
          error={errors.signaturePng?.message}
          disabled={isSubmitting}
          focusRef={signature.field.ref}
        />
      </section>

      <FormError messages={formError} />

      <div className="flex flex-col-reverse gap-4 border-t border-sand-300 pt-6 sm:flex-row sm:items-center sm:justify-between">
        {decline ? (
          <Button variant="secondary" className="min-h-14 text-lg" onClick={() => setConfirmDecline(true)} disabled={isSubmitting}>
            I don’t want to sign now
          </Button>
        ) : (
          <span />
        )}
        <Button type="submit" className="min-h-14 px-8 text-xl" pending={isSubmitting} pendingLabel="Sending…" data-testid="sign-submit">
          Sign and submit
        </Button>
      </div>

      {decline ? (
        <ConfirmDialog
          open={confirmDecline}
          title="Not signing now?"
          confirmLabel="Yes, hand the tablet back"
          tone="primary"
          pending={declining}
          error={declineError}
          onCancel={() => setConfirmDecline(false)}
          onConfirm={() => void onDecline()}
        >
          <p>Nothing you entered is kept. The tablet will ask you to hand it back to the department; they can ask you again another time.</p>
        </ConfirmDialog>
      ) : null}
    </form>
  );
}

function ErrorLine({ id, message }: { id: string; message: string }) {
  return (
    <p id={id} className="flex items-start gap-1 text-lg font-semibold text-brick-700">
      <span aria-hidden="true">!</span>
      {message}
    </p>
  );
}

type BigTextFieldProps = React.InputHTMLAttributes<HTMLInputElement> & { label: string; hint?: string; error?: string; ref?: React.Ref<HTMLInputElement> };

function BigTextField({ label, hint, error, ...rest }: BigTextFieldProps) {
  const id = useId();
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="text-xl font-semibold text-ink-900">
        {label}
      </label>
      {hint ? (
        <p id={`${id}-hint`} className="text-ink-700">
          {hint}
        </p>
      ) : null}
      <input
        id={id}
        type="text"
        className="block min-h-14 w-full rounded-xl border-2 border-ink-500 bg-white px-4 py-2 text-xl text-ink-900 aria-invalid:border-brick-700 disabled:bg-sand-100"
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(`${id}-hint`, `${id}-error`, hint, error)}
        {...rest}
      />
      {error ? <ErrorLine id={`${id}-error`} message={error} /> : null}
    </div>
  );
}

function QuestionField({ question: q, control, error, disabled }: { question: Question; control: Control<SigningValues>; error?: string; disabled: boolean }) {
  const id = useId();
  const name = `answers.${q.id}` as const;
  const { field } = useController({ control, name });
  const helpId = `${id}-help`;
  const errorId = `${id}-error`;
  const medicalId = `${id}-medical`;
  const described = [q.help ? helpId : null, q.medical ? medicalId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;

  const legend = (
    <>
      <span>{q.label}</span> <span className="text-base font-normal text-ink-700">{q.required ? '(required)' : '(optional)'}</span>
    </>
  );
  const notes = (
    <>
      {q.help ? (
        <p id={helpId} className="text-ink-700">
          {q.help}
        </p>
      ) : null}
      {q.medical ? (
        <p id={medicalId} className="text-base text-ink-700">
          Health detail: only the production’s designated lead and you will see this answer.
        </p>
      ) : null}
      {error ? <ErrorLine id={errorId} message={error} /> : null}
    </>
  );

  if (q.type === 'short_text') {
    return (
      <div className="flex flex-col gap-2" data-testid={`question-${q.id}`}>
        <label htmlFor={id} className="text-xl font-semibold text-ink-900">
          {legend}
        </label>
        <input
          id={id}
          ref={field.ref}
          name={field.name}
          type="text"
          autoComplete="off"
          value={typeof field.value === 'string' ? field.value : ''}
          onChange={(e) => field.onChange(e.target.value)}
          onBlur={field.onBlur}
          disabled={disabled}
          className="block min-h-14 w-full rounded-xl border-2 border-ink-500 bg-white px-4 py-2 text-xl text-ink-900 aria-invalid:border-brick-700 disabled:bg-sand-100"
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
        />
        {notes}
      </div>
    );
  }

  const options: { label: string; value: boolean | string }[] =
    q.type === 'yes_no' ? [{ label: 'Yes', value: true }, { label: 'No', value: false }] : (q.options ?? []).map((o) => ({ label: o, value: o }));

  return (
    <fieldset className="flex flex-col gap-3" aria-describedby={described} data-testid={`question-${q.id}`}>
      <legend className="mb-2 text-xl font-semibold text-ink-900">{legend}</legend>
      <div className={q.type === 'yes_no' ? 'grid grid-cols-2 gap-3' : 'flex flex-col gap-3'}>
        {options.map((o, i) => (
          <label
            key={String(o.value)}
            className={`flex min-h-14 cursor-pointer items-center gap-4 rounded-xl border-2 bg-white px-4 py-2 text-xl font-semibold text-ink-900 has-checked:border-clay-700 has-checked:bg-clay-50 ${
              error ? 'border-brick-700' : 'border-ink-500'
            }`}
          >
            <input
              ref={i === 0 ? field.ref : undefined}
              type="radio"
              name={`${id}-${q.id}`}
              className="size-7 shrink-0 cursor-pointer accent-clay-700"
              checked={field.value === o.value}
              onChange={() => field.onChange(o.value)}
              onBlur={field.onBlur}
              disabled={disabled}
            />
            <span>{o.label}</span>
          </label>
        ))}
      </div>
      {notes}
    </fieldset>
  );
}
