import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Link, useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { CreateProductInputSchema } from '#shared/schemas/catalogue.ts';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { paths } from '../../../lib/paths.ts';
import { useCreateProduct } from '../api.ts';
import { LabelEditor } from '../components/label-editor.tsx';
import { PRODUCT_FIELD_NAMES, ProductFields, productFormSchema, productFormValues, type ProductFormValues } from '../components/product-fields.tsx';

type CreateOutput = z.output<typeof CreateProductInputSchema>;
const FormSchema = productFormSchema(CreateProductInputSchema);

export function NewProductPage() {
  const navigate = useNavigate();
  const create = useCreateProduct();
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<ProductFormValues, unknown, CreateOutput>({
    resolver: zodResolver(FormSchema),
    defaultValues: { ...productFormValues(), inciLabel: '', formulationNote: '' },
  });
  const { errors } = form.formState;
  const category = useWatch({ control: form.control, name: 'category' });
  const label = useWatch({ control: form.control, name: 'inciLabel' }) ?? '';

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const detail = await create.mutateAsync(values);
      void navigate(paths.product.href(detail.id));
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, PRODUCT_FIELD_NAMES));
    }
  });

  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.catalogue.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;Catalogue
        </Link>
      </nav>
      <PageHeading title="Add a product" lead="Use the product’s own name as the maker prints it. The ingredient list becomes its first formulation.">
        Add a product
      </PageHeading>
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-6" aria-label="Add a product" data-testid="new-product-form">
        <Section title="The product">
          <ProductFields register={form.register} errors={errors} category={category} hasFigures={false} />
        </Section>
        <Section title="Ingredients">
          <LabelEditor field={form.register('inciLabel')} value={label} error={errors.inciLabel?.message} canAddIngredients />
          <TextField label="Note on this formulation" autoComplete="off" hint="Optional, for example where the list came from." error={errors.formulationNote?.message} {...form.register('formulationNote')} />
        </Section>
        <FormError messages={formError} />
        <div className="flex flex-wrap gap-3">
          <Button type="submit" pending={create.isPending} pendingLabel="Adding…">
            Add product
          </Button>
          <ButtonLink variant="secondary" to={paths.catalogue.href()}>
            Cancel
          </ButtonLink>
        </div>
      </form>
    </>
  );
}
