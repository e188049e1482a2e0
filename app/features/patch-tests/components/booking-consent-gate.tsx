import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { consentCheckQueryOptions } from '../../bookings/index.ts';
import { SendFormNow } from '../../consents/index.ts';

/**
 * On the patch-test booking form: as soon as the performer is chosen, whether they will have an active
 * patch-testing consent for this production (at the time typed, else now), asked of the server's own
 * rule. Without one the test can still be booked, and waits for consent; the form can go out at once.
 */
export function BookingConsentGate({ performerId, performerName, production, startsAt }: { performerId: string; performerName: string; production: { id: string; name: string }; startsAt: string | null }) {
  // Before a time is typed the question is about now; fixed when the form opened, so the query key holds still.
  const [openedAt] = useState(() => new Date().toISOString());
  const check = useQuery(consentCheckQueryOptions({ performerId, productionId: production.id, purpose: 'patch_test', startsAt: startsAt ?? openedAt }));
  if (!check.data?.missing) return null;
  return (
    <div className="flex flex-col gap-3 rounded-xl border-l-4 border-brick-700 bg-brick-50 p-4 text-graphite-900" data-testid="book-test-consent-gate">
      <output className="block font-semibold">
        {performerName} has no active patch-testing consent for {production.name}
        {startsAt ? ' when the test starts' : ''}. You can still book the test: it is saved as waiting for consent, and it cannot be applied until {performerName} signs.
      </output>
      <SendFormNow performerId={performerId} productionId={production.id} kind="patch_testing" />
      <p className="text-sm text-graphite-700">Signing on this tablet hands it to the performer and leaves this page; book the test when it comes back.</p>
    </div>
  );
}
