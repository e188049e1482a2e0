import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { UserListQuerySchema, type User } from '#shared/schemas/admin.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { usersQueryOptions } from '../api.ts';
import { AddUserForm } from '../components/add-user-form.tsx';
import { EditUserDialog } from '../components/edit-user-dialog.tsx';
import { UsersTable } from '../components/users-table.tsx';

export async function usersLoader({ request }: LoaderFunctionArgs) {
  const query = parseListParams(UserListQuerySchema, new URL(request.url).searchParams);
  await prefetchFor('users.manage', usersQueryOptions(query));
  return null;
}

export function UsersPage() {
  const [query, setQuery] = useListParams(UserListQuerySchema);
  const users = useQuery(usersQueryOptions(query));
  const [search, setSearch] = useDebouncedSearch(query.q ?? '', (q) => setQuery({ q }, { resetPage: true }));
  const [editing, setEditing] = useState<User | null>(null);
  const waitingOnly = query.access === 'none';

  return (
    <>
      <PageHeading title="Users" lead="Everyone who may sign in to Plinth. Register a person by e-mail (under “Add user” below), then give them a role on a production.">
        Users
      </PageHeading>

      <Section title={waitingOnly ? 'People waiting for access' : 'People'} testId="users-section">
        <search aria-label="Find people">
        <form className="grid gap-4 md:grid-cols-[2fr_1fr]" onSubmit={(e) => e.preventDefault()}>
          <TextField
            label="Search people"
            type="search"
            hint="By name or e-mail address."
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            data-testid="users-search"
          />
          <SelectField
            label="Show"
            value={query.access}
            onChange={(e) => setQuery({ access: e.target.value as 'all' | 'none' }, { resetPage: true })}
            data-testid="users-access-filter"
          >
            <option value="all">Everyone</option>
            <option value="none">Waiting for access</option>
          </SelectField>
        </form>
      </search>
        <QueryView query={users} loadingLabel="Loading people…">
          {(data) => (
            <>
              {data.items.length === 0 ? (
                <EmptyState title={query.q ? `No one matches “${query.q}”.` : waitingOnly ? 'No one is waiting for access.' : 'No users yet.'}>
                  {waitingOnly && !query.q ? 'Everyone who has signed in has a role somewhere.' : null}
                </EmptyState>
              ) : (
                <UsersTable
                  users={data.items}
                  caption={waitingOnly ? 'People waiting for access' : 'People'}
                  sort={query.sort}
                  dir={query.dir}
                  busy={users.isPlaceholderData}
                  onSort={(sort, dir) => setQuery({ sort, dir }, { resetPage: true })}
                  onEdit={setEditing}
                />
              )}
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="people" onPage={(page) => setQuery({ page }, { push: true })} />
            </>
          )}
        </QueryView>
      </Section>

      <Section title="Add user">
        <AddUserForm />
      </Section>

      <EditUserDialog user={editing} onClose={() => setEditing(null)} />
    </>
  );
}
