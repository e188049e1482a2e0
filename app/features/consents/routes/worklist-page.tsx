import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { ConsentWorkPanels } from '../components/withdrawal-notices.tsx';

/** The department's consent work that needs a look: withdrawals since you last looked, and for the lead, health answers. */
export function WorklistPage() {
  const session = useSession();
  const production = seatProduction(session);
  const isLead = session.current?.role === 'lead' && seatCan(session, 'medical.read');
  return (
    <>
      <PageHeading title="Consent worklist" lead={production ? `Consent work on ${production.name} that needs a look.` : undefined}>
        Consent worklist
      </PageHeading>
      {production ? <ConsentWorkPanels productionId={production.id} isLead={isLead} /> : <p className="text-ink-700">Switch “Acting as” to a production.</p>}
    </>
  );
}
