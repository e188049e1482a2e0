import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import type { z } from 'zod';
import { IdSchema } from '#shared/schemas/common.ts';
import { UpdatePerformerInputSchema, type PerformerDetail } from '#shared/schemas/performers.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { performerQueryOptions, useUpdatePerformer } from '../api.ts';
import { EngagementFields, PERFORMER_FIELD_NAMES, PerformerFields, engagementFieldNames } from '../components/performer-fields.tsx';
import { displayName } from '../components/names.tsx';

export async function editPerformerLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('performers.manage', performerQueryOptions(id.data));
  return null;
}

export function EditPerformerPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <EditPerformer id={id.data} />;
}

function EditPerformer({ id }: { id: string }) {
  const performer = useQuery(performerQueryOptions(id));
  const p = performer.data;
  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.performer.href(id)} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;{p ? displayName(p) : 'Performer'}
        </Link>
      </nav>
      <PageHeading title={p ? `Edit ${displayName(p)}` : 'Edit performer'}>{p ? `Edit ${displayName(p)}` : 'Edit performer'}</PageHeading>
      <QueryView query={performer} loadingLabel="Loading the performer…">
        {(data) =>
          data.canEdit ? (
            // Keyed by id: another performer starts a fresh form.
            <EditForm key={data.id} performer={data} />
          ) : (
            <p className="text-ink-700">You cannot edit this performer in your current role.</p>
          )
        }
      </QueryView>
    </>
  );
}

function valuesOf(p: PerformerDetail): z.input<typeof UpdatePerformerInputSchema> {
  const c = p.contact;
  return {
    legalName: p.legalName,
    preferredName: p.preferredName ?? '',
    pronouns: p.pronouns ?? '',
    email: c?.email ?? '',
    phone: c?.phone ?? '',
    emergencyContactName: c?.emergencyContactName ?? '',
    emergencyContactPhone: c?.emergencyContactPhone ?? '',
    agentName: c?.agentName ?? '',
    agentContact: c?.agentContact ?? '',
    notes: c?.notes ?? '',
    engagements: p.engagements.map((e) => ({ productionId: e.productionId, characterName: e.characterName ?? '', startsOn: e.startsOn, endsOn: e.endsOn })),
    version: p.version,
  };
}

function EditForm({ performer }: { performer: PerformerDetail }) {
  const session = useSession();
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const update = useUpdatePerformer(performer.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const [engagements, setEngagements] = useState(performer.engagements);
  const form = useForm<z.input<typeof UpdatePerformerInputSchema>, unknown, z.output<typeof UpdatePerformerInputSchema>>({
    resolver: zodResolver(UpdatePerformerInputSchema),
    defaultValues: valuesOf(performer),
  });
  const { errors } = form.formState;
  // The acting seat manages performers on its own production only; other engagements go back unchanged.
  const manages = (productionId: string) => session.current?.productionId === productionId && seatCan(session, 'performers.manage');

  const edit = useVersionedEdit({
    refetch: () => queryClient.fetchQuery({ ...performerQueryOptions(performer.id), staleTime: 0 }),
    onFresh: (fresh) => {
      form.reset(valuesOf(fresh));
      setEngagements(fresh.engagements);
    },
  });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      if (await edit.save(() => update.mutateAsync(values))) void navigate(paths.performer.href(performer.id));
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, [...PERFORMER_FIELD_NAMES, ...engagementFieldNames(engagements.length)]));
    }
  });


  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-6" aria-label="Edit performer" data-testid="edit-performer-form">
      <Section title="Who they are">
        <PerformerFields register={form.register} errors={errors} />
      </Section>
      <Section title="Engagements">
        {engagements.map((e, i) => (
          <EngagementFields key={e.productionId} index={i} productionName={e.productionName} register={form.register} errors={errors} readOnly={!manages(e.productionId)} />
        ))}
        {errors.engagements?.message ? <p className="text-sm font-semibold text-brick-700">{errors.engagements.message}</p> : null}
      </Section>
      <VersionedEditNotice edit={edit} />
      <FormError messages={formError} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={update.isPending} pendingLabel="Saving…" disabled={edit.conflict !== null}>
          Save changes
        </Button>
        <ButtonLink variant="secondary" to={paths.performer.href(performer.id)}>
          Cancel
        </ButtonLink>
      </div>
    </form>
  );
}
