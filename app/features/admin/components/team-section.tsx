import { useState } from 'react';
import { ROLE_LABELS } from '#shared/policy.ts';
import type { Membership, ProductionDetail } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDate } from '../../../lib/format.ts';
import { useRemoveMembership } from '../api.ts';
import { AddMemberForm } from './add-member-form.tsx';
import { EmailAddress } from '../../../components/ui/email-address.tsx';

export function TeamSection({ production }: { production: ProductionDetail }) {
  const remove = useRemoveMembership(production.id);
  const [removing, setRemoving] = useState<Membership | null>(null);
  const leadId = production.lead?.userId ?? null;
  const staysLead =
    removing !== null && removing.userId === leadId && production.memberships.filter((m) => m.userId === removing.userId).length === 1;

  function close() {
    setRemoving(null);
    remove.reset();
  }

  return (
    <Section title="Team" testId="team-section">
      {production.memberships.length === 0 ? (
        <EmptyState title="No one is on this team yet.">Add people below; the designated lead is chosen from the team.</EmptyState>
      ) : (
        <Table caption={`Team of ${production.name}`} captionHidden testId="team-table">
          <Thead>
            <tr>
              <Th>Name</Th>
              <Th>E-mail</Th>
              <Th>Role</Th>
              <Th>Added</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </Thead>
          <tbody>
            {production.memberships.map((m) => (
              <Tr key={m.id}>
                <Td className="font-semibold">
                  {m.displayName}
                  {m.userId === leadId ? (
                    <span className="ml-2">
                      <StatusBadge tone="accent">{ROLE_LABELS.lead}</StatusBadge>
                    </span>
                  ) : null}
                </Td>
                <Td>
                  <EmailAddress value={m.email} />
                </Td>
                <Td>{ROLE_LABELS[m.role]}</Td>
                <Td className="whitespace-nowrap">
                  <time dateTime={m.createdAt}>{formatDate(m.createdAt)}</time>
                </Td>
                <Td className="text-right">
                  <Button variant="secondary" aria-label={`Remove ${m.displayName} as ${ROLE_LABELS[m.role]}`} onClick={() => setRemoving(m)}>
                    Remove
                  </Button>
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}

      <h3 className="text-lg font-bold text-ink-900">Add to team</h3>
      <AddMemberForm production={production} />

      <ConfirmDialog
        open={removing !== null}
        title={removing ? `Remove ${removing.displayName}?` : 'Remove from the team?'}
        confirmLabel="Remove"
        pending={remove.isPending}
        error={remove.error}
        onCancel={close}
        onConfirm={() => {
          if (removing) remove.mutate(removing.id, { onSuccess: close });
        }}
      >
        {removing ? (
          <>
            <p>
              {removing.displayName} will no longer act as {ROLE_LABELS[removing.role]} on {production.name}.
            </p>
            {staysLead ? (
              <p className="mt-2 font-semibold">They stay the designated lead until you end that appointment below.</p>
            ) : null}
          </>
        ) : null}
      </ConfirmDialog>
    </Section>
  );
}
