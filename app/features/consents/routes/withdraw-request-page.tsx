import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { RequestWithdrawalLinkInputSchema } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { useRequestWithdrawalLink } from '../api.ts';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';

/** Withdrawing without a sign-in: the performer asks for a link by e-mail. The answer never says whether the address is known. */
export function WithdrawRequestPage() {
  const request = useRequestWithdrawalLink();
  const [sent, setSent] = useState<string | null>(null);
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm({ resolver: zodResolver(RequestWithdrawalLinkInputSchema), defaultValues: { email: '' } });

  const onSubmit = form.handleSubmit(async ({ email }) => {
    setFormError(null);
    try {
      const res = await request.mutateAsync(email);
      setSent(res.message);
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['email']));
    }
  });

  return (
    <PublicFrame title="Withdraw a consent" narrow>
      <h1 className="text-3xl font-bold text-ink-900">Withdraw a consent</h1>
      <p className="text-lg text-ink-700">
        You can withdraw any consent you gave the make-up department, at any time, without giving a reason. Enter the e-mail
        address the department has for you and Plinth will send you a link to see your consents and withdraw them.
      </p>
      {sent ? (
        <output className="block rounded-xl border-l-4 border-sage-700 bg-sage-100 p-4 text-lg text-sage-800" data-testid="withdraw-link-sent">
          {sent}
        </output>
      ) : (
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4 rounded-2xl border border-sand-300 bg-white p-6" aria-label="Ask for a withdrawal link">
          <TextField label="Your e-mail address" type="email" autoComplete="email" error={form.formState.errors.email?.message} {...form.register('email')} />
          <FormError messages={formError} />
          <div>
            <Button type="submit" pending={request.isPending} pendingLabel="Sending…">
              Send me a link
            </Button>
          </div>
        </form>
      )}
      <p className="text-ink-700">You can also ask the department in person, or sign in to Plinth if you have an account.</p>
    </PublicFrame>
  );
}
