/**
 * One entry of a device's outbox, as it is stored on the device and later pushed (DESIGN.md §4).
 * - `mutationId` is unique per change; the server answers a mutation id it has seen with its earlier
 *   result, so a retried batch is applied once.
 * - `baseRevision` is the revision the device's edit started from (0 for a record made on the device);
 *   the server detects concurrent edits by comparing it with its own revision.
 * - `payload` is the whole record after the change (records are facts: never merged field by field);
 *   a deletion is the record with `deleted: true` (a tombstone), never a removal.
 * - `queuedAt` is the device clock: recorded, never used for ordering.
 */
import { z } from 'zod';
import { UuidSchema } from '../schemas/common';
import { CAPTURE_ENTITIES, type CaptureEntity } from '../schemas/capture';

export const MUTATION_ENTITIES = Object.keys(CAPTURE_ENTITIES) as [CaptureEntity, ...CaptureEntity[]];

export const MutationSchema = z.object({
  mutationId: UuidSchema,
  entity: z.enum(MUTATION_ENTITIES),
  recordId: UuidSchema,
  surveyId: UuidSchema,
  baseRevision: z.number().int().min(0),
  payload: z.record(z.string(), z.unknown()),
  queuedAt: z.iso.datetime({ offset: true }),
});
export type Mutation = z.infer<typeof MutationSchema>;

/** The next revision a device gives a record it changes: one past the revision the edit started from. */
export function nextRevision(baseRevision: number): number {
  return baseRevision + 1;
}
