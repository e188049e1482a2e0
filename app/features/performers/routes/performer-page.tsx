import { useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { IdSchema } from '#shared/schemas/common.ts';
import type { PerformerDetail } from '#shared/schemas/performers.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { PageAnchor, PageIndex } from '../../../components/ui/page-index.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { PerformerCasts } from '../../archive/index.ts';
import { PerformerBuilds } from '../../builds/index.ts';
import { ClearanceSummaryLine, PerformerPatchTests } from '../../patch-tests/index.ts';
import { PerformerCard } from '../../checks/index.ts';
import { BookingForm, BookingsTable } from '../../bookings/index.ts';
import { HealthSummarySection } from '../../consents/index.ts';
import { PERFORMER_PAGE_ACTIONS, seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { performerQueryOptions, useResendConfirmation } from '../api.ts';
import { ConsentsSection } from '../components/consents-section.tsx';
import { HealthReads } from '../components/health-reads.tsx';
import { LinkedAccount } from '../components/linked-account.tsx';
import { displayName } from '../components/names.tsx';
import { PortraitPanel } from '../components/portrait-panel.tsx';
import { ConsentSummaryLine, EngagementLine } from '../components/record-summary.tsx';
import { seatProduction } from '../../../lib/session/seat-production.ts';

export async function performerLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor(PERFORMER_PAGE_ACTIONS, performerQueryOptions(id.data));
  return null;
}

export function PerformerPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <PerformerView id={id.data} />;
}

function PerformerView({ id }: { id: string }) {
  const session = useSession();
  const performer = useQuery(performerQueryOptions(id));
  const isSelf = session.current?.role === 'performer' && session.performerIds.includes(id);

  if (!performer.data && isApiError(performer.error, 404)) {
    return (
      <>
        <PageHeading title="Performer not found">Performer not found</PageHeading>
        <p className="max-w-prose text-ink-700">There is no performer at this address. The link may be wrong.</p>
        <div>
          <ButtonLink to={paths.performers.href()}>All performers</ButtonLink>
        </div>
      </>
    );
  }

  return (
    <>
      {!isSelf ? (
        <nav aria-label="Breadcrumb">
          <Link to={paths.performers.href()} className="inline-flex min-h-11 items-center font-semibold">
            <span aria-hidden="true">←</span>&nbsp;All performers
          </Link>
        </nav>
      ) : null}
      <QueryView query={performer} loadingLabel="Loading the performer…">
        {(data) => <PerformerRecord performer={data} isSelf={isSelf} />}
      </QueryView>
    </>
  );
}

function PerformerRecord({ performer: p, isSelf }: { performer: PerformerDetail; isSelf: boolean }) {
  const session = useSession();
  const queryClient = useQueryClient();
  const name = displayName(p);
  const production = seatProduction(session);
  // Staff act on the seat's production, and only where the performer is engaged on it.
  const engagedHere = production !== null && p.engagements.some((e) => e.productionId === production.id);
  const requestOn = engagedHere && seatCan(session, 'consents.request') ? production : null;
  const canBook = engagedHere && seatCan(session, 'patchtests.book');
  const bookings = p.bookings;

  // What staff act on leads (who, where, consents, then requests and sessions); records below.
  const index = [
    { id: 'consents', label: 'Consents' },
    { id: 'sessions', label: 'Sessions' },
    { id: 'clearances', label: 'Clearances' },
    ...(isSelf || seatCan(session, 'casts.read') ? [{ id: 'casts', label: 'Life casts' }] : []),
    ...(isSelf || seatCan(session, 'builds.read') ? [{ id: 'appliances', label: 'Appliances' }] : []),
    ...(p.contact ? [{ id: 'contact', label: 'Contact' }] : []),
    { id: 'engagements', label: 'Engagements' },
    ...(p.canSeeMedical ? [{ id: 'health', label: 'Health details' }] : []),
  ];

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-6 sm:flex-row sm:items-start">
        <PortraitPanel performer={p} />
        <div className="flex min-w-0 flex-1 flex-col gap-3">
          <PageHeading
            title={isSelf ? 'My record' : name}
            testId="performer-heading"
            lead={
              <>
                {p.preferredName && p.preferredName !== p.legalName ? <span className="block">Legal name: {p.legalName}</span> : null}
                <span className="block">{p.pronouns ? `Pronouns: ${p.pronouns}` : 'No pronouns given'}</span>
              </>
            }
            actions={
              p.canEdit ? (
                <ButtonLink variant="secondary" to={paths.editPerformer.href(p.id)} data-testid="edit-performer">
                  Edit
                </ButtonLink>
              ) : undefined
            }
          >
            {name}
          </PageHeading>
          <EngagementLine performer={p} productionId={production?.id ?? null} />
          <ConsentSummaryLine performer={p} production={isSelf ? null : production} />
          <ClearanceSummaryLine performerId={p.id} />
          {isSelf ? (
            <p className="max-w-prose text-graphite-700">
              This is what the department holds about you. You can withdraw any consent below, as easily as you gave it.
            </p>
          ) : null}
        </div>
      </div>

      <PageIndex items={index} />

      <PageAnchor id="consents">
        <ConsentsSection performer={p} requestOn={requestOn} />
        {seatCan(session, 'medical.read') && !isSelf ? <HealthSummarySection performerId={p.id} /> : null}
      </PageAnchor>

      <PageAnchor id="sessions">
        <Section title="Sessions" testId="sessions-section">
          {bookings.length === 0 ? (
            <p className="text-graphite-700">No sessions booked from now on.</p>
          ) : (
            <BookingsTable bookings={bookings} caption={`Upcoming sessions of ${name}`} canCancel={canBook} />
          )}
          {canBook && production ? (
            <>
              <h3 className="text-lg font-bold text-graphite-900">Book a session</h3>
              <BookingForm performerId={p.id} productionId={production.id} />
            </>
          ) : null}
        </Section>
      </PageAnchor>

      <PageAnchor id="clearances">
        <PerformerPatchTests performerId={p.id} isSelf={isSelf} />
      </PageAnchor>

      <PageAnchor id="casts">
        <PerformerCasts performerId={p.id} name={name} isSelf={isSelf} />
      </PageAnchor>
      <PageAnchor id="appliances">
        <PerformerBuilds performerId={p.id} isSelf={isSelf} />
      </PageAnchor>
      {isSelf ? null : <PerformerCard performerId={p.id} />}

      {p.contact ? (
        <PageAnchor id="contact">
          <Section title="Contact" testId="contact-section">
            <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-[max-content_1fr]">
              <EmailRow performer={p} />
              <ContactRow label="Phone" value={p.contact.phone} />
              <ContactRow label="Emergency contact" value={[p.contact.emergencyContactName, p.contact.emergencyContactPhone].filter(Boolean).join(', ') || null} />
              <ContactRow label="Agent" value={[p.contact.agentName, p.contact.agentContact].filter(Boolean).join(', ') || null} />
              <ContactRow label="Notes" value={p.contact.notes} />
            </dl>
          </Section>
        </PageAnchor>
      ) : null}

      <LinkedAccount performer={p} isSelf={isSelf} onReload={() => queryClient.fetchQuery({ ...performerQueryOptions(p.id), staleTime: 0 })} />

      <PageAnchor id="engagements">
        <Section title="Engagements">
          {p.engagements.length === 0 ? (
            <p className="text-graphite-700">No engagements you can see.</p>
          ) : (
            <ul className="flex flex-col divide-y divide-plaster-200" data-testid="engagements">
              {p.engagements.map((e) => (
                <li key={e.productionId} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
                  <span>
                    <span className="font-semibold">{e.productionName}</span>
                    {e.characterName ? <span> as {e.characterName}</span> : null}
                  </span>
                  <span className="text-sm text-graphite-700">
                    {e.startsOn || e.endsOn ? `${e.startsOn ? formatDate(e.startsOn) : 'Open start'} – ${e.endsOn ? formatDate(e.endsOn) : 'open end'}` : 'No dates'}
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Section>
      </PageAnchor>

      {p.canSeeMedical ? (
        <PageAnchor id="health">
          <HealthReads performerId={p.id} isSelf={isSelf} />
        </PageAnchor>
      ) : null}
    </div>
  );
}

/** The address, and whether the performer confirmed it (only then does their mail go there). */
function EmailRow({ performer: p }: { performer: PerformerDetail }) {
  const resend = useResendConfirmation(p.id);
  const email = p.contact?.email ?? null;
  return (
    <>
      <dt className="font-semibold text-ink-700">E-mail</dt>
      <dd className="flex flex-col gap-2">
        {email ? (
          <span className="flex flex-wrap items-center gap-2">
            <span className="break-all">{email}</span>
            {p.contact?.emailConfirmed ? (
              <StatusBadge tone="good">Confirmed</StatusBadge>
            ) : (
              <StatusBadge tone="warning">Awaiting confirmation</StatusBadge>
            )}
          </span>
        ) : (
          <span className="text-ink-600">Not given</span>
        )}
        {email && !p.contact?.emailConfirmed ? (
          <span className="flex flex-col gap-2 text-sm text-ink-700">
            <span>Until {displayName(p)} confirms it, this address gets nothing but the confirmation request: no signed copies, no signing or withdrawal links.</span>
            {p.canEdit ? (
              <span className="flex flex-wrap items-center gap-3">
                <Button variant="secondary" pending={resend.isPending} pendingLabel="Sending…" onClick={() => resend.mutate()}>
                  Send the confirmation again
                </Button>
                {resend.isSuccess ? <output className="font-semibold text-sage-800">Sent.</output> : null}
              </span>
            ) : null}
            {resend.isError ? <ErrorBanner error={resend.error} /> : null}
          </span>
        ) : null}
      </dd>
    </>
  );
}

function ContactRow({ label, value }: { label: string; value: string | null }) {
  return (
    <>
      <dt className="font-semibold text-ink-700">{label}</dt>
      <dd className="break-words">{value ?? <span className="text-ink-600">Not given</span>}</dd>
    </>
  );
}
