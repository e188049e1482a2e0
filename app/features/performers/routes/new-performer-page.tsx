import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { CreatePerformerInputSchema } from '#shared/schemas/performers.ts';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { paths } from '../../../lib/paths.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { useCreatePerformer } from '../api.ts';
import { EngagementFields, PERFORMER_FIELD_NAMES, PerformerFields, engagementFieldNames } from '../components/performer-fields.tsx';
import { seatProduction } from '../../../lib/session/seat-production.ts';

export function NewPerformerPage() {
  const session = useSession();
  const production = seatProduction(session);
  const navigate = useNavigate();
  const create = useCreatePerformer();
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<z.input<typeof CreatePerformerInputSchema>, unknown, z.output<typeof CreatePerformerInputSchema>>({
    resolver: zodResolver(CreatePerformerInputSchema),
    defaultValues: {
      legalName: '',
      preferredName: '',
      pronouns: '',
      email: '',
      phone: '',
      emergencyContactName: '',
      emergencyContactPhone: '',
      agentName: '',
      agentContact: '',
      notes: '',
      engagements: production ? [{ productionId: production.id, characterName: '', startsOn: null, endsOn: null }] : [],
    },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const performer = await create.mutateAsync(values);
      void navigate(paths.performer.href(performer.id));
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, [...PERFORMER_FIELD_NAMES, ...engagementFieldNames(1)]));
    }
  });

  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.performers.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;All performers
        </Link>
      </nav>
      <PageHeading title="Add performer" lead={production ? `They are engaged on ${production.name}.` : undefined}>
        Add performer
      </PageHeading>
      {production ? (
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-6" aria-label="Add performer" data-testid="new-performer-form">
          <Section title="Who they are">
            <PerformerFields register={form.register} errors={errors} />
          </Section>
          <Section title="Engagement">
            <EngagementFields index={0} productionName={production.name} register={form.register} errors={errors} />
            {errors.engagements?.message ? <p className="text-sm font-semibold text-brick-700">{errors.engagements.message}</p> : null}
          </Section>
          <FormError messages={formError} />
          <div className="flex flex-wrap gap-3">
            <Button type="submit" pending={create.isPending} pendingLabel="Adding…">
              Add performer
            </Button>
            <ButtonLink variant="secondary" to={paths.performers.href()}>
              Cancel
            </ButtonLink>
          </div>
        </form>
      ) : (
        <p className="text-ink-700">Switch “Acting as” to a production you manage performers on.</p>
      )}
    </>
  );
}
