import { IdParamsSchema } from '#shared/schemas/common.ts';
import {
  IngredientDetailSchema,
  IngredientInputSchema,
  IngredientListQuerySchema,
  IngredientPageSchema,
  LabelMatchesSchema,
  MatchLabelInputSchema,
  UpdateIngredientInputSchema,
} from '#shared/schemas/catalogue.ts';
import { defineRoute } from '../../http/route.ts';
import { listIngredients } from './ingredient-repo.ts';
import { createIngredient, ingredientDetail, labelMatches, resolveLabel, updateIngredient } from './ingredient-service.ts';

const TAG = 'catalogue';

/** The ingredient vocabulary: studio-wide, read by all staff, kept by heads and leads. */
export const ingredientRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/ingredients',
    summary: 'The ingredient vocabulary, by INCI name; search by INCI name, synonym or CAS number, filter by allergen group',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    query: IngredientListQuerySchema,
    response: IngredientPageSchema,
    errors: [403],
    async handler({ ctx, query }) {
      return { ...(await listIngredients(ctx.db, query)), page: query.page, pageSize: query.pageSize };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/ingredients/match',
    summary: 'Match a pasted ingredient list ("Ingredients: Aqua, …") to the vocabulary, name by name in label order',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    body: MatchLabelInputSchema,
    response: LabelMatchesSchema,
    errors: [403],
    async handler({ ctx, body }) {
      return labelMatches(await resolveLabel(ctx.db, body.label));
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/ingredients/:id',
    summary: 'One ingredient, with the products whose current formulation lists it',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    params: IdParamsSchema,
    response: IngredientDetailSchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      return ingredientDetail(ctx.db, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/ingredients',
    summary: 'Add an ingredient; its INCI name, synonyms and CAS number must be new to the vocabulary (409 otherwise). Label names waiting for it are linked',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    body: IngredientInputSchema,
    response: IngredientDetailSchema,
    status: 201,
    errors: [403, 409],
    async handler({ ctx, actor, body, req }) {
      return createIngredient(ctx, actor, req, body);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/ingredients/:id',
    summary: 'Edit an ingredient at the version it was read (409 when stale or when a name belongs to another ingredient)',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.manage',
    params: IdParamsSchema,
    body: UpdateIngredientInputSchema,
    response: IngredientDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return updateIngredient(ctx, actor, req, params.id, body);
    },
  }),
];
