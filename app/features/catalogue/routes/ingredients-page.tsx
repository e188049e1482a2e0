import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { ALLERGEN_GROUPS, ALLERGEN_GROUP_LABELS } from '#shared/domain/ingredients.ts';
import { IngredientListQuerySchema, type IngredientListQuery, type IngredientRecord } from '#shared/schemas/catalogue.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { ingredientsQueryOptions, useCreateIngredient, useUpdateIngredient } from '../api.ts';
import { GroupBadge } from '../components/badges.tsx';
import { IngredientForm, ingredientFormValues } from '../components/ingredient-form.tsx';

export async function ingredientsLoader({ request }: LoaderFunctionArgs) {
  await prefetchFor('catalogue.read', ingredientsQueryOptions(parseListParams(IngredientListQuerySchema, new URL(request.url).searchParams)));
  return null;
}

export function IngredientsPage() {
  const session = useSession();
  const [params, setParams] = useListParams(IngredientListQuerySchema);
  const list = useQuery(ingredientsQueryOptions(params));
  const [search, setSearch] = useDebouncedSearch(params.q ?? '', (q) => setParams({ q }, { resetPage: true }));
  const canManage = seatCan(session, 'catalogue.manage');
  const create = useCreateIngredient();
  const [editing, setEditing] = useState<IngredientRecord | null>(null);
  const [formKey, setFormKey] = useState(0);

  return (
    <>
      <PageHeading title="Ingredients" lead="The vocabulary labels are matched against: INCI names with their other names, CAS numbers where known, and allergen groups.">
        Ingredients
      </PageHeading>
      <Section title="Vocabulary">
        <search aria-label="Find ingredients">
          <form className="grid gap-4 md:grid-cols-2" onSubmit={(e) => e.preventDefault()}>
            <TextField label="Search" type="search" hint="INCI name, other name or CAS number." value={search} onChange={(e) => setSearch(e.target.value)} data-testid="ingredients-search" />
            <SelectField label="Allergen group" value={params.group ?? ''} onChange={(e) => setParams({ group: (e.target.value || undefined) as IngredientListQuery['group'] }, { resetPage: true })}>
              <option value="">Any group</option>
              {ALLERGEN_GROUPS.map((g) => (
                <option key={g} value={g}>
                  {ALLERGEN_GROUP_LABELS[g]}
                </option>
              ))}
            </SelectField>
          </form>
        </search>
        <QueryView query={list} loadingLabel="Loading the vocabulary…">
          {(data) => (
            <>
              {data.items.length === 0 ? (
                <EmptyState title="No ingredient matches.">Try another spelling, or a CAS number.</EmptyState>
              ) : (
                <Table caption="Ingredients" captionHidden busy={list.isPlaceholderData} testId="ingredients-table">
                  <Thead>
                    <tr>
                      <Th>INCI name</Th>
                      <Th>Group</Th>
                      <Th>CAS</Th>
                      <Th>Products</Th>
                      {canManage ? (
                        <Th>
                          <span className="sr-only">Actions</span>
                        </Th>
                      ) : null}
                    </tr>
                  </Thead>
                  <tbody>
                    {data.items.map((i) => (
                      <Tr key={i.id}>
                        <Td>
                          <span className="font-semibold">{i.inci}</span>
                          {i.synonyms.length ? <span className="block text-sm text-ink-700">Also: {i.synonyms.join(', ')}</span> : null}
                        </Td>
                        <Td>
                          <span className="flex flex-wrap items-center gap-1">
                            <GroupBadge group={i.group} />
                            {i.trivial ? <span className="text-sm text-ink-700">Carrier</span> : null}
                          </span>
                        </Td>
                        <Td>{i.cas ?? <span className="text-ink-600">Not given</span>}</Td>
                        <Td>{i.productCount}</Td>
                        {canManage ? (
                          <Td>
                            <Button variant="quiet" onClick={() => setEditing(i)} aria-label={`Edit ${i.inci}`}>
                              Edit
                            </Button>
                          </Td>
                        ) : null}
                      </Tr>
                    ))}
                  </tbody>
                </Table>
              )}
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="ingredients" onPage={(page) => setParams({ page }, { push: true })} />
            </>
          )}
        </QueryView>
      </Section>
      {canManage ? (
        <Section title="Add an ingredient">
          <IngredientForm key={formKey} defaults={ingredientFormValues()} submitLabel="Add ingredient" testId="add-ingredient-form" onSubmit={async (input) => {
            await create.mutateAsync(input);
            setFormKey((k) => k + 1);
          }} />
        </Section>
      ) : null}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing ? `Edit ${editing.inci}` : 'Edit ingredient'}>
        {editing ? <EditIngredient ingredient={editing} onDone={() => setEditing(null)} /> : null}
      </Dialog>
    </>
  );
}

function EditIngredient({ ingredient: i, onDone }: { ingredient: IngredientRecord; onDone: () => void }) {
  const update = useUpdateIngredient(i.id);
  return (
    <IngredientForm
      defaults={ingredientFormValues(i)}
      submitLabel="Save ingredient"
      onCancel={onDone}
      onSubmit={async (input) => {
        await update.mutateAsync({ ingredient: input, version: i.version });
        onDone();
      }}
    />
  );
}
