import { Link } from 'react-router-dom';
import { buttonClasses } from '../../../components/ui/button.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { seatCan } from '../../../lib/session/seat.ts';

/** The performer's printable card with the QR code the check scans, and the check itself. */
export function PerformerCard({ performerId }: { performerId: string }) {
  const session = useSession();
  const canCheck = seatCan(session, 'clearance.check');
  return (
    <Section title="Card for the check" testId="performer-card">
      <p className="text-ink-700">Print the card and keep it with the performer’s kit: scanning its code opens the check with this performer chosen. It carries the name only.</p>
      <div className="flex flex-wrap gap-3">
        <a className={buttonClasses('secondary')} href={serverPaths.performerCard(performerId, 'pdf')} target="_blank" rel="noreferrer">
          Print the card (PDF)
        </a>
        <a className={buttonClasses('secondary')} href={serverPaths.performerCard(performerId, 'png')} download>
          Download the code (PNG)
        </a>
        {canCheck ? (
          <Link className={buttonClasses('primary')} to={paths.check.href({ performerId })}>
            Run a check
          </Link>
        ) : null}
      </div>
    </Section>
  );
}
