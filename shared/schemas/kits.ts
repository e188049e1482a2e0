import { z } from 'zod';
import { IdSchema, VersionSchema } from './common.ts';

/*
 * Kits: named lists of products a production uses together ("Day 12 — scar appliance"), kept by the
 * head and the artists. Nothing here is medical.
 */

const KitNameSchema = z.string({ error: 'Name the kit' }).trim().min(1, 'Name the kit').max(120, 'At most 120 characters');
const KitProductIdsSchema = z
  .array(z.uuid({ message: 'Choose a product from the catalogue' }), { error: 'List the products' })
  .min(1, 'A kit needs at least one product')
  .max(60, 'At most 60 products in a kit')
  .refine((ids) => new Set(ids).size === ids.length, 'Each product only once');

export const CreateKitInputSchema = z.object({ productionId: IdSchema, name: KitNameSchema, productIds: KitProductIdsSchema });
export type CreateKitInput = z.infer<typeof CreateKitInputSchema>;

export const UpdateKitInputSchema = z.object({ name: KitNameSchema, productIds: KitProductIdsSchema, version: VersionSchema });
export type UpdateKitInput = z.infer<typeof UpdateKitInputSchema>;

export const KitListQuerySchema = z.object({ productionId: IdSchema });

export const KitProductSchema = z.object({ id: z.string(), name: z.string(), category: z.string() });

export const KitSchema = z.object({
  id: z.string(),
  productionId: z.string(),
  name: z.string(),
  products: z.array(KitProductSchema),
  updatedAt: z.string(),
  updatedByName: z.string().nullable(),
  version: z.number().int(),
  canManage: z.boolean(),
});
export type Kit = z.infer<typeof KitSchema>;

export const KitListSchema = z.object({ items: z.array(KitSchema), canManage: z.boolean() });
export type KitList = z.infer<typeof KitListSchema>;
