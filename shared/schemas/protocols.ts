import { z } from 'zod';
import { IdSchema, VersionSchema } from './common.ts';
import { ProtocolSchema, ReadingPointSchema, TestKindSchema } from './patch-tests.ts';

/*
 * Test protocols as the API serves them. Each edit publishes a new version and keeps the old ones,
 * so a test booked on a protocol keeps the exact readings it was booked with (it stores `versionId`).
 */

export const ProtocolIdSchema = z.string().regex(/^[a-z0-9-]{1,60}$/, 'Not a protocol id');
export const ProtocolParamsSchema = z.object({ id: ProtocolIdSchema });

/** An edit: the whole protocol as it should read, and the version it was based on. */
export const UpdateProtocolInputSchema = z.object({ protocol: ProtocolSchema, version: VersionSchema });
export type UpdateProtocolInput = z.input<typeof UpdateProtocolInputSchema>;

/** One published version of a protocol; a version never changes once published. */
export const ProtocolVersionSchema = z.object({
  /** What a booked test stores. */
  versionId: IdSchema,
  version: z.number().int(),
  protocol: z.object({
    id: z.string(),
    name: z.string(),
    kind: TestKindSchema,
    description: z.string(),
    occlusionMinutes: z.number().int().nullable(),
    applications: z.object({ timesPerDay: z.number().int(), days: z.number().int(), sameSite: z.boolean() }),
    readings: z.array(ReadingPointSchema),
  }),
  createdAt: z.string(),
  createdBy: z.string().nullable(),
});
export type ProtocolVersion = z.infer<typeof ProtocolVersionSchema>;

export const ProtocolListSchema = z.object({ items: z.array(ProtocolVersionSchema) });
/** Newest first. */
export const ProtocolHistorySchema = z.object({ items: z.array(ProtocolVersionSchema) });
