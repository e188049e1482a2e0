import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { z } from 'zod';
import { IdSchema } from '#shared/schemas/common.ts';
import { InciLabelSchema, UpdateProductInputSchema, type ProductDetail } from '#shared/schemas/catalogue.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { invalidate } from '../../../lib/query-keys.ts';
import { productQueryOptions, useAddFormulation, useRecordIngredients, useUpdateProduct } from '../api.ts';
import { LabelEditor } from '../components/label-editor.tsx';
import { PRODUCT_FIELD_NAMES, ProductFields, productFormSchema, productFormValues, type ProductFormValues } from '../components/product-fields.tsx';

export async function editProductLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('catalogue.manage', productQueryOptions(id.data));
  return null;
}

export function EditProductPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <EditProduct id={id.data} />;
}

function EditProduct({ id }: { id: string }) {
  const product = useQuery(productQueryOptions(id));
  const title = product.data ? `Edit ${product.data.name}` : 'Edit product';
  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.product.href(id)} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;{product.data?.name ?? 'Product'}
        </Link>
      </nav>
      <PageHeading title={title}>{title}</PageHeading>
      <QueryView query={product} loadingLabel="Loading the product…">
        {(p) => (
          <div className="flex flex-col gap-6">
            <DetailsForm key={`${p.id}-${p.version}`} product={p} />
            <FormulationForm key={`f-${p.id}-${p.version}`} product={p} />
          </div>
        )}
      </QueryView>
    </>
  );
}

const UpdateFormSchema = productFormSchema(UpdateProductInputSchema);

function DetailsForm({ product: p }: { product: ProductDetail }) {
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const update = useUpdateProduct(p.id);
  const [conflict, setConflict] = useState<unknown>(null);
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<ProductFormValues, unknown, z.output<typeof UpdateProductInputSchema>>({ resolver: zodResolver(UpdateFormSchema), defaultValues: productFormValues(p) });
  const { errors } = form.formState;
  const category = useWatch({ control: form.control, name: 'category' });
  const hasFigures = p.densityGPerCm3 !== null || p.mixRatio !== null || p.makerMaxSoftenerPercent !== null;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await update.mutateAsync(values);
      void navigate(paths.product.href(p.id));
    } catch (err) {
      if (isApiError(err, 409) && !Object.keys(err.fields).length) return setConflict(err);
      setFormError(formErrorsFrom(err, form.setError, PRODUCT_FIELD_NAMES));
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} aria-label="Product details" data-testid="edit-product-form">
      <Section title="Product details">
        <ProductFields register={form.register} errors={errors} category={category} hasFigures={hasFigures} />
        {conflict ? <ConflictNotice error={conflict} onReload={() => void invalidate(queryClient, [productQueryOptions(p.id).queryKey])} /> : null}
        <FormError messages={formError} />
        <div className="flex flex-wrap gap-3">
          <Button type="submit" pending={update.isPending} pendingLabel="Saving…" disabled={conflict !== null}>
            Save changes
          </Button>
          <ButtonLink variant="secondary" to={paths.product.href(p.id)}>
            Cancel
          </ButtonLink>
        </div>
      </Section>
    </form>
  );
}

const FormulationFormSchema = z.object({ inciLabel: InciLabelSchema, note: z.string().trim().max(500) });
type FormulationValues = z.input<typeof FormulationFormSchema>;

/** A changed label is a new formulation; a formulation with nothing recorded gets its list recorded instead. */
function FormulationForm({ product: p }: { product: ProductDetail }) {
  const navigate = useNavigate();
  const current = p.formulations.find((f) => f.current);
  const recording = current !== undefined && current.ingredients === null;
  const add = useAddFormulation(p.id);
  const record = useRecordIngredients(p.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<FormulationValues, unknown, z.output<typeof FormulationFormSchema>>({ resolver: zodResolver(FormulationFormSchema), defaultValues: { inciLabel: '', note: '' } });
  const { errors, isSubmitting } = form.formState;
  const label = useWatch({ control: form.control, name: 'inciLabel' }) ?? '';

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      if (recording) {
        if (values.inciLabel === null) return form.setError('inciLabel', { message: 'Paste the ingredient list' });
        await record.mutateAsync({ formulationId: current.id, inciLabel: values.inciLabel, version: p.version });
      } else {
        await add.mutateAsync({ inciLabel: values.inciLabel, note: values.note || null, version: p.version });
      }
      void navigate(paths.product.href(p.id));
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['inciLabel', 'note']));
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} aria-label={recording ? 'Record the ingredients' : 'New formulation'} data-testid="formulation-form">
      <Section title={recording ? 'Record the ingredients' : 'New formulation'}>
        <p className="text-ink-700">
          {recording
            ? 'This formulation has no ingredient list yet. Record it once from the label; a later change is a new formulation.'
            : `The maker changed the product? A new formulation replaces version ${current?.version ?? 1} as current and is untested again for every performer. Lots keep the formulation they were made to.`}
        </p>
        <LabelEditor field={form.register('inciLabel')} value={label} error={errors.inciLabel?.message} canAddIngredients />
        {recording ? null : <TextField label="What changed" autoComplete="off" hint="Optional." error={errors.note?.message} {...form.register('note')} />}
        <FormError messages={formError} />
        <div>
          <Button type="submit" variant={recording ? 'primary' : 'secondary'} pending={isSubmitting} pendingLabel="Saving…">
            {recording ? 'Record ingredients' : 'Add formulation'}
          </Button>
        </div>
      </Section>
    </form>
  );
}
