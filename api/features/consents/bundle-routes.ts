import { IdParamsSchema } from '#shared/schemas/common.ts';
import { BundleLinkViewSchema, BundleRequestParamsSchema, BundleTokenParamsSchema, CreateSigningBundleInputSchema, SigningBundleSchema } from '#shared/schemas/consent-bundles.ts';
import { HandOverResultSchema, SubmitSignatureInputSchema, SubmitSignatureResultSchema } from '#shared/schemas/consents.ts';
import { rateLimiter } from '../../http/rate-limit.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { bundleLinkSubmit, bundleLinkView, createSigningBundle, handOverBundle } from './bundle-service.ts';

const publicLimiter = rateLimiter({ name: 'signing-bundle-links', windowMs: 60_000, limit: 30, message: 'Too many attempts. Wait a minute and try again.' });

export const bundleRoutes: AnyRoute[] = [
  defineRoute({
    method: 'post',
    path: '/api/signing-bundles',
    summary: 'Ask a performer to sign several forms at once: one after another on this tablet, or from one e-mailed link',
    tag: 'consents',
    auth: 'session',
    body: CreateSigningBundleInputSchema,
    response: SigningBundleSchema,
    status: 201,
    errors: [403, 404],
    handler: ({ ctx, actor, body, req }) => createSigningBundle(ctx, actor, body, req),
  }),
  defineRoute({
    method: 'post',
    path: '/api/signing-bundles/:id/hand-over',
    summary: 'Lend this browser to the performer for every form of the bundle still to sign, with one hand-back at the end',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    response: HandOverResultSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, req }) => handOverBundle(ctx, actor, params.id, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/signing-bundles/link/:token',
    summary: 'The forms one e-mailed link walks through, in order (nothing else)',
    tag: 'signing',
    auth: 'public',
    params: BundleTokenParamsSchema,
    response: BundleLinkViewSchema,
    before: [publicLimiter],
    errors: [404, 409, 429],
    handler: ({ ctx, params }) => bundleLinkView(ctx, params.token),
  }),
  defineRoute({
    method: 'post',
    path: '/api/signing-bundles/link/:token/requests/:requestId',
    summary: 'Sign one form of an e-mailed bundle',
    tag: 'signing',
    auth: 'public',
    params: BundleRequestParamsSchema,
    body: SubmitSignatureInputSchema,
    response: SubmitSignatureResultSchema,
    status: 201,
    before: [publicLimiter],
    errors: [404, 409, 429],
    handler: ({ ctx, params, body, req }) => bundleLinkSubmit(ctx, params.token, params.requestId, body, req),
  }),
];
