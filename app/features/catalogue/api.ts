import { keepPreviousData, queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import {
  IngredientDetailSchema,
  IngredientPageSchema,
  LabelMatchesSchema,
  ProductDetailSchema,
  ProductPageSchema,
  type CreateLotInput,
  type CreateProductInput,
  type IngredientInput,
  type IngredientListQuery,
  type NewFormulationInput,
  type ProductDetail,
  type ProductListQuery,
  type UpdateLotInput,
  type UpdateProductInput,
} from '#shared/schemas/catalogue.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { ingredientsKey, invalidate, productsKey } from '../../lib/query-keys.ts';

// ---- products

export function productsQueryOptions(query: ProductListQuery) {
  return queryOptions({
    queryKey: [...productsKey, 'list', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/products', query), ProductPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

export function productQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...productsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(productPath(id), ProductDetailSchema, signal),
  });
}

function productPath(id: string, rest = '') {
  return `/api/products/${encodeURIComponent(id)}${rest}`;
}

/** Every product write answers with the fresh detail: keep it, and mark the lists it may change. */
export async function productWritten(queryClient: QueryClient, detail: ProductDetail) {
  queryClient.setQueryData(productQueryOptions(detail.id).queryKey, detail);
  await invalidate(queryClient, [[...productsKey, 'list'], ingredientsKey]);
}

function useProductMutation<I>(fn: (input: I) => Promise<ProductDetail>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: fn, onSuccess: (detail) => productWritten(queryClient, detail) });
}

export function useCreateProduct() {
  return useProductMutation((input: CreateProductInput) => api.post('/api/products', input, ProductDetailSchema));
}

export function useUpdateProduct(id: string) {
  return useProductMutation((input: UpdateProductInput) => api.put(productPath(id), input, ProductDetailSchema));
}

export function useAddFormulation(id: string) {
  return useProductMutation((input: NewFormulationInput) => api.post(productPath(id, '/formulations'), input, ProductDetailSchema));
}

export function useRecordIngredients(id: string) {
  return useProductMutation((input: { formulationId: string; inciLabel: string; version: number }) =>
    api.put(productPath(id, `/formulations/${encodeURIComponent(input.formulationId)}/ingredients`), { inciLabel: input.inciLabel, version: input.version }, ProductDetailSchema),
  );
}

export function useAddLot(id: string) {
  return useProductMutation((input: CreateLotInput) => api.post(productPath(id, '/lots'), input, ProductDetailSchema));
}

export function useUpdateLot(id: string) {
  return useProductMutation((input: UpdateLotInput & { lotId: string }) => {
    const { lotId, ...body } = input;
    return api.put(productPath(id, `/lots/${encodeURIComponent(lotId)}`), body, ProductDetailSchema);
  });
}

export function useRetireLot(id: string) {
  return useProductMutation((input: { lotId: string; retired: boolean; version: number }) =>
    api.put(productPath(id, `/lots/${encodeURIComponent(input.lotId)}/retired`), { retired: input.retired, version: input.version }, ProductDetailSchema),
  );
}

/** The safety-data-sheet upload (multipart field "sds" with the product's version), for useUpload().start. */
export function safetySheetUpload(product: Pick<ProductDetail, 'id' | 'version'>, file: File) {
  return { url: productPath(product.id, '/safety-data-sheet'), method: 'PUT' as const, field: 'sds', file, fields: { version: String(product.version) }, schema: ProductDetailSchema };
}

// ---- the vocabulary

export function ingredientsQueryOptions(query: IngredientListQuery) {
  return queryOptions({
    queryKey: [...ingredientsKey, 'list', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/ingredients', query), IngredientPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

export function ingredientQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...ingredientsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/ingredients/${encodeURIComponent(id)}`, IngredientDetailSchema, signal),
  });
}

function useIngredientMutation<I>(fn: (input: I) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    // A new or renamed entry may link names on any product, so products are read again too.
    onSuccess: () => invalidate(queryClient, [ingredientsKey, productsKey]),
  });
}

export function useCreateIngredient() {
  return useIngredientMutation((input: IngredientInput) => api.post('/api/ingredients', input, IngredientDetailSchema));
}

export function useUpdateIngredient(id: string) {
  return useIngredientMutation((input: { ingredient: IngredientInput; version: number }) => api.put(`/api/ingredients/${encodeURIComponent(id)}`, input, IngredientDetailSchema));
}

/** Matches a pasted list to the vocabulary on the server, with the same rules the clearance check uses. */
export function useMatchLabel() {
  return useMutation({ mutationFn: (label: string) => api.post('/api/ingredients/match', { label }, LabelMatchesSchema) });
}
