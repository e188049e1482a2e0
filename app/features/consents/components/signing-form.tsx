import { zodResolver } from '@hookform/resolvers/zod';
import { useId, useMemo, useRef, useState } from 'react';
import { useController, useForm, useWatch, type Path } from 'react-hook-form';
import { z } from 'zod';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { answersSchemaFor, type Question } from '#shared/domain/questionnaire.ts';
import { SubmitSignatureInputSchema, type SigningForm, type SubmitSignatureInput } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Caution } from '../../../components/consent/caution.tsx';
import { ConsentText } from '../../../components/consent/consent-text.tsx';
import { SignatureField } from './signature-field.tsx';
import { AnswerProgress, MissingSummary, partLabel, type MissingItem } from './signing-progress.tsx';
import { BigTextField, ErrorLine, QuestionField } from './signing-fields.tsx';

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
  /** Where this form stands among several signed one after another: declining moves on to the next. */
  progress?: { position: number; total: number };
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
export function SigningFormView({ form: signing, idempotencyKey, mode, submit, onSigned, decline, onDeclined, progress }: SigningFormProps) {
  const { template } = signing;
  const schema = useMemo(() => signingSchema(template.questions, mode), [template.questions, mode]);
  const form = useForm<z.input<typeof schema>, unknown, z.output<typeof schema>>({
    resolver: zodResolver(schema),
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
        {progress ? (
          <p className="text-xl font-bold text-clay-700" data-testid="signing-progress">
            Form {progress.position} of {progress.total}
          </p>
        ) : null}
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
            {progress ? 'I don’t want to sign this one' : 'I don’t want to sign now'}
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
          title={progress ? 'Not signing this form?' : 'Not signing now?'}
          confirmLabel={progress ? (progress.position < progress.total ? 'Yes, go to the next form' : 'Yes, finish') : 'Yes, hand the tablet back'}
          tone="primary"
          pending={declining}
          error={declineError}
          onCancel={() => setConfirmDecline(false)}
          onConfirm={() => void onDecline()}
        >
          <p>
            {progress
              ? 'Nothing you entered on this form is kept. Forms you already signed stay signed. The department can ask you about this one again another time.'
              : 'Nothing you entered is kept. The tablet will ask you to hand it back to the department; they can ask you again another time.'}
          </p>
        </ConfirmDialog>
      ) : null}
    </form>
  );
}
