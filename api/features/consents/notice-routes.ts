import { OkSchema } from '#shared/schemas/common.ts';
import {
  ConfirmHealthReviewInputSchema,
  ConsentNoticeQuerySchema,
  HealthSummaryQuerySchema,
  HealthSummarySchema,
  HealthWorklistSchema,
  MarkSeenInputSchema,
  WithdrawalNoticeListSchema,
} from '#shared/schemas/consent-notices.ts';
import { confirmHealthReview, healthSummary, healthWorklist } from './health-service.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { listWithdrawalNotices, markWithdrawalsSeen } from './notice-service.ts';

export const noticeRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/consent-notices/withdrawals',
    summary: "Consents withdrawn on a production's record since you last looked, with the sessions each leaves waiting (reasons only to the designated lead, audited)",
    tag: 'consents',
    auth: 'session',
    query: ConsentNoticeQuerySchema,
    response: WithdrawalNoticeListSchema,
    errors: [403],
    handler: ({ ctx, actor, query, req }) => listWithdrawalNotices(ctx, actor, query.productionId, req),
  }),
  defineRoute({
    method: 'post',
    path: '/api/consent-notices/withdrawals/seen',
    summary: 'Mark the withdrawals listed up to a moment as seen',
    tag: 'consents',
    auth: 'session',
    body: MarkSeenInputSchema,
    response: OkSchema,
    errors: [403],
    handler: ({ ctx, actor, body, req }) => markWithdrawalsSeen(ctx, actor, body.productionId, body.seenAt, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/consent-notices/health',
    summary: "The designated lead's worklist: health answers that need a look since the lead last confirmed each performer (medical read, audited)",
    tag: 'consents',
    auth: 'session',
    query: ConsentNoticeQuerySchema,
    response: HealthWorklistSchema,
    errors: [403],
    handler: ({ ctx, actor, query, req }) => healthWorklist(ctx, actor, query.productionId, req),
  }),
  defineRoute({
    method: 'post',
    path: '/api/consent-notices/health/reviews',
    summary: "The designated lead confirms having looked at a performer's health answers up to a moment",
    tag: 'consents',
    auth: 'session',
    body: ConfirmHealthReviewInputSchema,
    response: OkSchema,
    errors: [403],
    handler: ({ ctx, actor, body, req }) => confirmHealthReview(ctx, actor, body, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/consent-notices/health-summary',
    summary: "A performer's health answers gathered from all their consents, with the form and date of each (medical read, audited)",
    tag: 'consents',
    auth: 'session',
    query: HealthSummaryQuerySchema,
    response: HealthSummarySchema,
    errors: [403, 404],
    handler: ({ ctx, actor, query, req }) => healthSummary(ctx, actor, query.performerId, req),
  }),
];
