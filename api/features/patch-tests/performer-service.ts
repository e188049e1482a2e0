import type { Request } from 'express';
import { productOutcome } from '#shared/domain/test-outcome.ts';
import { type Actor, can } from '#shared/policy.ts';
import { type ClearanceRow, type OverrideInput, type PerformerPatchTests, SHARED_CAUTIONS_PAGE_SIZE, TEST_TIMELINE_PAGE_SIZE } from '#shared/schemas/patch-test-log.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { findPerformerScope } from '../performers/index.ts';
import { formulationKnownFor } from './clearance-repo.ts';
import { loadTableFacts } from './clearance-scope.ts';
import { countPerformerTests, insertOverride, listOverrideNotes, listTestRows } from './repo.ts';
import { renderSummaryPdf } from './summary-pdf.ts';
import { listTestSummaries, testDetail } from './view.ts';

/** Prints and exports carry every test (PostgreSQL's largest limit). */
const ALL_TESTS = 2 ** 31 - 1;

async function scopeFor(ctx: AppContext, actor: Actor, performerId: string) {
  const scope = await findPerformerScope(ctx.db, performerId);
  if (!scope) throw notFound('That performer');
  const resource = { performerId, performerProductionIds: scope.productionIds };
  authorize(actor, 'patchtests.read', resource);
  return { scope, resource };
}

/** Which pages of a performer's tests and shared-ingredient Cautions to give, or all of both (prints, exports). */
export type PatchTestsView = { testsPage: number; sharedPage: number } | 'all';

/**
 * A performer's tests (timeline, newest first, a page at a time) and clearance per product. Staff without
 * medical access get states, reasons and validity only; the lead and the performer also get the latest
 * outcome of each tested product and the override notes, and that read is audited.
 */
export async function performerPatchTests(ctx: AppContext, actor: Actor, performerId: string, req: Request, view: PatchTestsView = { testsPage: 1, sharedPage: 1 }): Promise<PerformerPatchTests> {
  const { scope, resource } = await scopeFor(ctx, actor, performerId);
  const isSelf = actor.performerIds.includes(performerId);
  const visible = isSelf ? scope.productionIds : scope.productionIds.filter((productionId) => can(actor, 'patchtests.read', { productionId }));
  const medical = can(actor, 'medical.read', resource);
  const now = new Date();
  const testsWhere = { performerId, productionIds: visible };
  const [tests, testsTotal, facts, notes] = await Promise.all([
    listTestSummaries(ctx.db, testsWhere, view === 'all' ? { newestFirst: true, offset: 0, limit: ALL_TESTS } : { newestFirst: true, offset: (view.testsPage - 1) * TEST_TIMELINE_PAGE_SIZE, limit: TEST_TIMELINE_PAGE_SIZE }),
    view === 'all' ? null : countPerformerTests(ctx.db, testsWhere),
    loadTableFacts(ctx.db, { performerId, now, sharedPage: view === 'all' ? undefined : { page: view.sharedPage, pageSize: SHARED_CAUTIONS_PAGE_SIZE } }),
    medical ? listOverrideNotes(ctx.db, performerId) : Promise.resolve(null),
  ]);
  const tested = new Set(facts.tested.map((t) => t.formulationId));
  // The latest tested product with readings per formulation, found once rather than once per row.
  const latestRead = new Map<string, (typeof facts.tested)[number]>();
  for (const t of facts.tested) if (t.readings.length > 0) latestRead.set(t.formulationId, t);
  const toRow = (r: (typeof facts.results)[number]): ClearanceRow => {
    const row: ClearanceRow = {
      productId: r.productId,
      productName: r.productName,
      formulationId: r.formulationId,
      state: r.state,
      reasons: r.reasons,
      validUntil: r.validUntil?.toISOString() ?? null,
      retestAdvised: r.retestAdvised,
      overridden: r.overridden,
      override: r.override ? { state: r.override.state, by: r.override.by, at: r.override.at.toISOString(), ...(notes ? { note: notes.get(r.formulationId) ?? '' } : {}) } : null,
      computedState: r.computedState,
    };
    if (medical) {
      const latest = latestRead.get(r.formulationId);
      if (latest) {
        const o = productOutcome(latest.readings);
        row.outcome = { strongest: o.strongest, final: o.final, pattern: o.pattern };
      }
    }
    return row;
  };
  const clearances = facts.results
    // A table of what matters for this performer: products tested, or answered by something other than "not tested".
    .filter((r) => tested.has(r.formulationId) || r.overridden || r.reasons[0]?.code !== 'not_tested' || r.state !== 'untested')
    .map(toRow);
  const sharedCautions = {
    items: facts.shared.results.map(toRow),
    total: facts.shared.total,
    page: view === 'all' ? 1 : view.sharedPage,
    pageSize: view === 'all' ? Math.max(1, facts.shared.total) : SHARED_CAUTIONS_PAGE_SIZE,
  };
  if (medical) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId, entityType: 'patch_tests', entityId: performerId, req, details: { performerId, fields: ['outcome', 'overrideNote'] } });
  }
  return {
    tests: {
      items: tests,
      total: testsTotal ?? tests.length,
      page: view === 'all' ? 1 : view.testsPage,
      pageSize: view === 'all' ? Math.max(1, tests.length) : TEST_TIMELINE_PAGE_SIZE,
    },
    clearances,
    sharedCautions,
    medical,
    canBook: scope.productionIds.some((productionId) => can(actor, 'patchtests.book', { productionId })),
    canOverride: scope.productionIds.some((productionId) => can(actor, 'clearance.override', { productionId })),
  };
}

/** The lead's override of one formulation's clearance, with a required note (sealed), audited. */
export async function overrideClearance(ctx: AppContext, actor: Actor, performerId: string, input: OverrideInput, req: Request): Promise<PerformerPatchTests> {
  const scope = await findPerformerScope(ctx.db, performerId);
  if (!scope) throw notFound('That performer');
  const productionId = scope.productionIds.find((p) => can(actor, 'clearance.override', { productionId: p }));
  authorize(actor, 'clearance.override', { performerId, productionId: productionId ?? scope.productionIds[0] ?? null });
  const expiresAt = input.expiresAt ? new Date(input.expiresAt) : null;
  if (expiresAt && expiresAt.getTime() <= Date.now()) throw invalid({ expiresAt: ['Choose an end date that has not passed'] });
  if (!(await formulationKnownFor(ctx.db, { performerId, formulationId: input.formulationId }))) throw invalid({ formulationId: ['That product formulation is not in the catalogue.'] });
  await ctx.db.transaction().execute(async (trx) => {
    const id = await insertOverride(trx, { performerId, productionId: productionId!, formulationId: input.formulationId, state: input.state, note: input.note, expiresAt, setBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'clearance.override', performerId, entityType: 'clearance_override', entityId: id, productionId, req, details: { formulationId: input.formulationId, state: input.state } });
  });
  return performerPatchTests(ctx, actor, performerId, req);
}

/** The printable summary of a performer's results: health details, so only for the lead and the performer, and audited. */
export async function performerSummaryPdf(ctx: AppContext, actor: Actor, performerId: string, req: Request): Promise<Buffer> {
  const { scope, resource } = await scopeFor(ctx, actor, performerId);
  authorize(actor, 'medical.read', resource);
  const data = await performerPatchTests(ctx, actor, performerId, req, 'all');
  const rows = await listTestRows(ctx.db, { ids: data.tests.items.filter((t) => t.status !== 'cancelled').map((t) => t.id) }, { newestFirst: true, offset: 0, limit: ALL_TESTS });
  // One detail per test: a print, read once, not a list screen.
  const tests = [];
  for (const row of rows) tests.push(await testDetail(ctx.db, row, { medical: true, now: new Date(), timeZone: ctx.config.timeZone }));
  return renderSummaryPdf({ performerName: scope.name, printedAt: new Date(), timeZone: ctx.config.timeZone, clearances: data.clearances, sharedCautions: data.sharedCautions.items, tests });
}
