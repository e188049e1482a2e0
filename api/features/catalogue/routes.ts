import { IdParamsSchema } from '#shared/schemas/common.ts';
import {
  CreateLotInputSchema,
  CreateProductInputSchema,
  FormulationParamsSchema,
  LotParamsSchema,
  NewFormulationInputSchema,
  ProductDetailSchema,
  ProductListQuerySchema,
  ProductPageSchema,
  RecordIngredientsInputSchema,
  RetireLotInputSchema,
  UpdateLotInputSchema,
  UpdateProductInputSchema,
} from '#shared/schemas/catalogue.ts';
import { defineRoute } from '../../http/route.ts';
import { sendSafetySheet, uploadSafetySheet } from './sds.ts';
import { addFormulation, addLot, createProduct, productDetail, productPage, recordIngredients, setLotRetired, updateLot, updateProduct } from './service.ts';

const TAG = 'catalogue';

/** Products, their formulations, lots and safety data sheets: studio-wide, read by all staff, kept by heads and leads. */
export const productRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/products',
    summary: 'The product catalogue, paged; search by name, maker or ingredient; filter by category, allergen group and expired lots',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    query: ProductListQuerySchema,
    response: ProductPageSchema,
    errors: [403],
    async handler({ ctx, query }) {
      return productPage(ctx.db, query);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/products/:id',
    summary: 'One product: every formulation with its ingredients in label order (current first), its lots and safety data sheet',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    params: IdParamsSchema,
    response: ProductDetailSchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      return productDetail(ctx.db, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/products',
    summary: 'Add a product with its first formulation, its ingredients pasted as printed on the label (or left unrecorded)',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    body: CreateProductInputSchema,
    response: ProductDetailSchema,
    status: 201,
    errors: [403, 409],
    async handler({ ctx, actor, body, req }) {
      return createProduct(ctx, actor, req, body);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/products/:id',
    summary: "Edit a product's own fields at the version it was read",
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: IdParamsSchema,
    body: UpdateProductInputSchema,
    response: ProductDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return updateProduct(ctx, actor, req, params.id, body);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/products/:id/formulations',
    summary: 'Add a new formulation, which becomes current: it is untested again for every performer, while new lots of the same formulation are not',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: IdParamsSchema,
    body: NewFormulationInputSchema,
    response: ProductDetailSchema,
    status: 201,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return addFormulation(ctx, actor, req, params.id, body);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/products/:id/formulations/:formulationId/ingredients',
    summary: 'Record the ingredients of a formulation that has none recorded (409 once recorded: a changed list is a new formulation)',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: FormulationParamsSchema,
    body: RecordIngredientsInputSchema,
    response: ProductDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return recordIngredients(ctx, actor, req, params.id, params.formulationId, body);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/products/:id/lots',
    summary: 'Add a lot (code unique within the product, last day of use, formulation: the current one unless named)',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: IdParamsSchema,
    body: CreateLotInputSchema,
    response: ProductDetailSchema,
    status: 201,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return addLot(ctx, actor, req, params.id, body);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/products/:id/lots/:lotId',
    summary: 'Edit a lot at the version it was read',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: LotParamsSchema,
    body: UpdateLotInputSchema,
    response: ProductDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return updateLot(ctx, actor, req, params.id, params.lotId, body);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/products/:id/lots/:lotId/retired',
    summary: 'Retire a lot (it stays on record but cannot be chosen for a test) or bring it back',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: LotParamsSchema,
    body: RetireLotInputSchema,
    response: ProductDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return setLotRetired(ctx, actor, req, params.id, params.lotId, body);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/products/:id/safety-data-sheet',
    summary: 'Upload the safety data sheet (multipart field "sds", a PDF read from its content, at most 10 MB; text field "version")',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: IdParamsSchema,
    multipart: true,
    response: ProductDetailSchema,
    errors: [403, 404, 409, 413],
    async handler({ ctx, actor, params, req, res }) {
      return uploadSafetySheet(ctx, actor, req, res, params.id);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/products/:id/safety-data-sheet',
    summary: "Download the product's safety data sheet (PDF)",
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    params: IdParamsSchema,
    produces: 'application/pdf',
    errors: [403, 404],
    async handler({ ctx, params, res }) {
      await sendSafetySheet(ctx, params.id, res);
    },
  }),
];
