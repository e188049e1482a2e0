import type { User, UserListQuery } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr, type SortDir } from '../../../components/ui/table.tsx';
import { formatDate, plural } from '../../../lib/format.ts';
import { EmailAddress } from '../../../components/ui/email-address.tsx';

type SortKey = UserListQuery['sort'];

interface UsersTableProps {
  users: User[];
  caption: string;
  sort: SortKey;
  dir: SortDir;
  busy: boolean;
  onSort: (sort: SortKey, dir: SortDir) => void;
  onEdit: (user: User) => void;
}

function AccessBadges({ user }: { user: User }) {
  return (
    <div className="flex flex-wrap gap-1">
      {user.isAdmin ? <StatusBadge tone="accent">Studio administrator</StatusBadge> : null}
      {user.membershipCount > 0 ? (
        <StatusBadge tone="good">{plural(user.membershipCount, 'role', 'roles')}</StatusBadge>
      ) : !user.isAdmin ? (
        <StatusBadge tone="warning">Waiting for access</StatusBadge>
      ) : null}
      {!user.linked ? <StatusBadge tone="neutral">Not signed in yet</StatusBadge> : null}
    </div>
  );
}

export function UsersTable({ users, caption, sort, dir, busy, onSort, onEdit }: UsersTableProps) {
  return (
    <Table caption={caption} captionHidden busy={busy} testId="users-table">
      <Thead>
        <tr>
          <SortHeader label="Name" sortKey="displayName" sort={sort} dir={dir} onSort={onSort} />
          <SortHeader label="E-mail" sortKey="email" sort={sort} dir={dir} onSort={onSort} />
          <Th>Access</Th>
          <SortHeader label="Added" sortKey="createdAt" sort={sort} dir={dir} onSort={onSort} />
          <Th>
            <span className="sr-only">Actions</span>
          </Th>
        </tr>
      </Thead>
      <tbody>
        {users.map((user) => (
          <Tr key={user.id}>
            <Td className="font-semibold">{user.displayName}</Td>
            <Td>
              <EmailAddress value={user.email} />
            </Td>
            <Td>
              <AccessBadges user={user} />
            </Td>
            <Td className="whitespace-nowrap">
              <time dateTime={user.createdAt}>{formatDate(user.createdAt)}</time>
            </Td>
            <Td className="text-right">
              <Button variant="secondary" aria-label={`Edit ${user.displayName}`} onClick={() => onEdit(user)}>
                Edit
              </Button>
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
