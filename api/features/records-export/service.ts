import type { Request } from 'express';
import archiver from 'archiver';
import type { Actor } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';
import { readStoredFile } from '../../files/store.ts';
import { recordEvent } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { notFound } from '../../http/errors.ts';
import { listApplicationProducts, listApplicationRows } from '../applications/index.ts';
import { castRecordsOfPerformer } from '../archive/index.ts';
import { listAuditAbout, listHealthReadsOf } from '../audit/index.ts';
import { findConsentDetailRow, listConsentAnswers, listConsentSummaries } from '../consents/index.ts';
import { performerBuilds } from '../builds/index.ts';
import { listReadingPhotosOfPerformer, patchTestDetail, performerPatchTests, renderPatchTestRecordPdf } from '../patch-tests/index.ts';
import { findPerformer, findPerformerScope, listEngagementsOf } from '../performers/index.ts';

const README = `Everything Plinth holds about you
================================

This archive is your copy of the records the make-up department keeps about you in Plinth:

  me.json            your details and the productions you are engaged on
  consents.json      every consent you signed, with your answers (health answers included) and any withdrawal
  consents/*.pdf     the signed copy of each consent
  casts.json         every life cast, mold and positive taken of you, where it is kept and every move it has made
  patch-tests.json   every skin patch test of yours with each reading, and what each product's clearance is
  patch-tests.pdf    the same record of your patch tests, printed
  patch-tests/photos/*.jpg  the photos taken of your test sites at readings (named in patch-tests.json)
  applications.json  every application logged on you: products and lots, times, and the skin check after removal
  appliances.json    every appliance piece made from your molds, with the materials and lots that went into it
  health-reads.json  who has read your health details, and when
  audit.json         every entry of Plinth's audit log about you: who recorded, changed or viewed what, and when

Plinth records skin screening and consent; it is not a medical diagnosis.
`;

/**
 * A performer's own records (their right of access), as one ZIP: for the performer themself, or
 * handed over by the designated lead. It holds health answers, so it is guarded and logged like them.
 */
export async function performerRecordsZip(ctx: AppContext, actor: Actor, performerId: string, req: Request): Promise<archiver.Archiver> {
  const scope = await findPerformerScope(ctx.db, performerId);
  if (!scope) throw notFound('That performer');
  authorize(actor, 'medical.read', { performerId, performerProductionIds: scope.productionIds });
  const performer = (await findPerformer(ctx.db, performerId))!;
  const [engagements, summaries, casts] = await Promise.all([listEngagementsOf(ctx.db, performerId), listConsentSummaries(ctx.db, performerId), castRecordsOfPerformer(ctx.db, performerId)]);
  const consents = [];
  const pdfs: { name: string; bytes: Buffer }[] = [];
  for (const s of summaries) {
    const detail = await findConsentDetailRow(ctx.db, s.id);
    const answers = await listConsentAnswers(ctx.db, s.id);
    consents.push({ ...s, body: detail?.body, answers, withdrawalReason: detail?.withdrawalReason ?? null, withdrawnVia: detail?.withdrawnVia ?? null, contentSha256: detail?.contentSha256, pdfSha256: detail?.pdfSha256 });
    const file = detail ? await readStoredFile(ctx.db, ctx.files, detail.pdfFileId) : null;
    if (file) pdfs.push({ name: `consents/${s.signedAt.slice(0, 10)}-${s.kind}-${s.id}.pdf`, bytes: file.bytes });
  }
  // The patch-test log, the application log and appliance builds: what touched their skin, and how it answered.
  const patchTests = await performerPatchTests(ctx, actor, performerId, req, 'all');
  const tests = [];
  for (const t of patchTests.tests.items) tests.push(await patchTestDetail(ctx, actor, t.id, req));
  // The reading photos, opened: the performer's own copy is the picture, not its sealed bytes.
  const photos: { name: string; bytes: Buffer }[] = [];
  const photoNames = new Map<string, string>();
  for (const p of await listReadingPhotosOfPerformer(ctx.db, performerId)) {
    const file = await readStoredFile(ctx.db, ctx.files, p.fileId);
    if (!file) continue;
    const name = `patch-tests/photos/${p.testId}-${p.photoId}.jpg`;
    photos.push({ name, bytes: file.bytes });
    photoNames.set(p.photoId, name);
  }
  const testsWithFiles = tests.map((t) => ({
    ...t,
    products: t.products.map((p) => ({ ...p, readings: p.readings?.map((r) => ({ ...r, photos: r.photos.map((ph) => ({ ...ph, file: photoNames.get(ph.id) ?? null })) })) })),
  }));
  const recordPdf = await renderPatchTestRecordPdf({
    performerName: performer.preferredName ?? performer.legalName,
    printedAt: new Date(),
    timeZone: ctx.config.timeZone,
    clearances: patchTests.clearances,
    sharedCautions: patchTests.sharedCautions.items,
    tests: tests.filter((t) => t.status !== 'cancelled'),
  });
  const applicationRows = await listApplicationRows(ctx.db, { productionIds: scope.productionIds, performerId });
  const applicationProducts = await listApplicationProducts(ctx.db, applicationRows.map((a) => a.id));
  const applications = applicationRows.map(({ check: _check, version: _v, ...a }) => ({ ...a, products: applicationProducts.get(a.id) ?? { applied: [], removal: [] } }));
  const builds = await performerBuilds(ctx, actor, performerId);
  // Read before this export's own entry is written: the log as it stood when the copy was asked for.
  const [reads, audit] = await Promise.all([listHealthReadsOf(ctx.db, performerId), listAuditAbout(ctx.db, performerId)]);
  await recordEvent(ctx.db, {
    actorUserId: actor.userId,
    action: 'medical.read',
    performerId,
    entityType: 'records_export',
    entityId: performerId,
    req,
    details: { fields: ['consentAnswers', 'withdrawalReasons', 'patchTestReadings', 'skinChecks'], consents: consents.length, casts: casts.length, patchTests: tests.length, readingPhotos: photos.length, applications: applications.length, handedOverBy: actor.performerIds.includes(performerId) ? null : actor.userId },
  });
  const zip = archiver('zip', { zlib: { level: 9 } });
  const json = (value: unknown) => JSON.stringify(value, null, 2);
  zip.append(README, { name: 'README.txt' });
  const { userId: _u, portraitFileId: _p, portraitThumbFileId: _t, ...me } = performer;
  zip.append(json({ ...me, engagements }), { name: 'me.json' });
  zip.append(json(consents), { name: 'consents.json' });
  for (const p of pdfs) zip.append(p.bytes, { name: p.name });
  zip.append(json(casts), { name: 'casts.json' });
  zip.append(json({ clearances: [...patchTests.clearances, ...patchTests.sharedCautions.items], tests: testsWithFiles }), { name: 'patch-tests.json' });
  zip.append(recordPdf, { name: 'patch-tests.pdf' });
  for (const p of photos) zip.append(p.bytes, { name: p.name });
  zip.append(json(applications), { name: 'applications.json' });
  zip.append(json(builds), { name: 'appliances.json' });
  zip.append(json(reads.map((r) => ({ at: r.at, who: r.who, what: r.entityType }))), { name: 'health-reads.json' });
  zip.append(json(audit), { name: 'audit.json' });
  void zip.finalize();
  return zip;
}
