/**
 * The sync wire contract (issue 5; DESIGN.md §4), used by the server's routes and the device's sync
 * engine. server/features/sync/sync.service.ts holds the full rules; in short:
 *
 * PUSH  POST /api/orgs/:orgId/sync/push  { deviceId, mutations: Mutation[] (1…500, ≤ 1 MB JSON) }
 *   → 200 { results: PushResult[] } — one per mutation, in the order sent:
 *     - `applied`  { revision, changeSeq, conflictId? }: the record now has this revision. conflictId is
 *       set when an edit revived a record another device had deleted (the edit is kept and a reviewer
 *       is asked, kind edit_vs_delete).
 *     - `conflict` { server, conflictId }: the record changed on the server since `baseRevision`; the
 *       server kept its version (`server`, the whole record) AND the incoming one, for a reviewer.
 *     - `rejected` { error: { code, message, details } }: nothing was written; the device keeps the
 *       mutation, marked, and may send it again (same or new mutation id) once fixed. Codes are in
 *       PUSH_REJECTION_CODES; STATION_UNKNOWN / WALK_UNKNOWN mean "send the parent first, then retry".
 *   A mutation id seen before is answered with the result it got the first time (applied or conflict)
 *   and applied no second time. Rejections are not remembered, so a retry after a fix is evaluated anew.
 *   A batch larger than 1 MB is refused whole (413): split it.
 *
 * PULL  GET /api/orgs/:orgId/sync/pull?since=<cursor>&limit=<1…5000, default 1000>
 *   → 200 { changes: [{ seq, entity, record }], nextCursor, hasMore }
 *   Ordered by the server's change sequence. Each record appears at most once per page, in its latest
 *   state (a record changed twice since the cursor arrives once, at its latest seq); tombstones are
 *   records with deleted: true. Store the page, then pull again with since = nextCursor while hasMore.
 *   The cursor is opaque (today the decimal seq of the last change in the page); "0" starts from the
 *   beginning. When the device's set of survey assignments grows, pull that survey from "0" again (or
 *   fetch its offline bundle): changes made before the assignment are behind the cursor.
 *
 * CONFLICTS  GET /api/orgs/:orgId/sync/conflicts?surveyId=&state=open|resolved|all
 *            POST /api/orgs/:orgId/sync/conflicts/:conflictId/resolve { choose: server | incoming, note? }
 * REPEATS    GET /api/orgs/:orgId/surveys/:surveyId/repeats
 * ATTACHMENTS PUT|GET /api/orgs/:orgId/attachments/:recordId/:kind  (see AttachmentUploadResultSchema)
 */
import { z } from 'zod';
import { FieldReadingSchema, StationSchema, SweepSchema, WalkSchema } from './capture';
import { UuidSchema } from './common';
import { SurveyStateSchema } from './home';
import { AssignmentRoleSchema, FlagKindSchema, FlagStateSchema, SeveritySchema, SpeciesSchema, VerdictSchema } from './vocabulary';

/** Most mutations one push may carry. */
export const PUSH_MAX_MUTATIONS = 500;
/** Pull page size when the device does not ask, and the most it may ask for. */
export const PULL_DEFAULT_LIMIT = 1000;
export const PULL_MAX_LIMIT = 5000;

// ---------------------------------------------------------------------------------------------- push

/**
 * The push body. Each mutation is checked on its own (a malformed one is `rejected`, the others still
 * apply), so the envelope here only needs a mutation id to answer to; shared/sync/mutation.ts's
 * MutationSchema is then applied per item.
 */
export const PushRequestSchema = z.object({
  deviceId: z.string().trim().min(1, 'Give the device id.').max(100),
  mutations: z
    .array(z.looseObject({ mutationId: UuidSchema }))
    .min(1, 'Send at least one mutation.')
    .max(PUSH_MAX_MUTATIONS, `Send at most ${PUSH_MAX_MUTATIONS} mutations per push.`),
});
export type PushRequest = z.infer<typeof PushRequestSchema>;

/** Why a mutation was refused (stable codes the device may branch on). */
export const PUSH_REJECTION_CODES = [
  /** The mutation or its payload failed the shared schema; details.issues lists the fields. */
  'VALIDATION_FAILED',
  /** payload.id / surveyId / organisationId differ from the mutation's or the URL's. */
  'PAYLOAD_MISMATCH',
  /** No such survey in this organisation (also what another organisation's survey looks like). */
  'SURVEY_NOT_FOUND',
  /** The survey is submitted or signed off: it takes no more captured data (details.state). */
  'SURVEY_NOT_OPEN',
  /** The user is not assigned to the survey. */
  'NOT_ASSIGNED',
  /** A surveyor may write only records made under their own name. */
  'NOT_OWNER',
  /** The record exists in another survey (records never move between surveys). */
  'SURVEY_MISMATCH',
  /** The record id cannot be used (taken outside this organisation). */
  'RECORD_ID_UNAVAILABLE',
  /** The reading's or sweep's station is not on the server (yet): push the station, then retry. */
  'STATION_UNKNOWN',
  /** The record's walk is not on the server (yet): push the walk, then retry. */
  'WALK_UNKNOWN',
  /** A level, room or instrument the record names does not exist in this organisation / site. */
  'REFERENCE_UNKNOWN',
  /** The database refused the record (a constraint the schema does not express); details.constraint. */
  'CONSTRAINT_FAILED',
] as const;
export const PushRejectionCodeSchema = z.enum(PUSH_REJECTION_CODES);
export type PushRejectionCode = z.infer<typeof PushRejectionCodeSchema>;

export const PushAppliedSchema = z.object({
  mutationId: UuidSchema,
  status: z.literal('applied'),
  revision: z.number().int().min(1),
  changeSeq: z.number().int().min(1),
  /** Set when the edit revived a record deleted on the server (an edit_vs_delete conflict was opened). */
  conflictId: UuidSchema.optional(),
});
export const PushConflictSchema = z.object({
  mutationId: UuidSchema,
  status: z.literal('conflict'),
  conflictId: UuidSchema,
  /** The server's current record (wire shape of the entity). */
  server: z.record(z.string(), z.unknown()),
});
export const PushRejectedSchema = z.object({
  mutationId: UuidSchema,
  status: z.literal('rejected'),
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
export const PushResultSchema = z.discriminatedUnion('status', [PushAppliedSchema, PushConflictSchema, PushRejectedSchema]);
export type PushResult = z.infer<typeof PushResultSchema>;
export const PushResponseSchema = z.object({ results: z.array(PushResultSchema) });
export type PushResponse = z.infer<typeof PushResponseSchema>;

// ---------------------------------------------------------------------------------------------- pull

export const PullQuerySchema = z.object({
  since: z
    .string()
    .regex(/^\d{1,15}$/, 'since is the cursor from the last pull ("0" for the beginning).')
    .default('0'),
  limit: z.coerce.number().int().min(1).max(PULL_MAX_LIMIT).default(PULL_DEFAULT_LIMIT),
});
export type PullQuery = z.infer<typeof PullQuerySchema>;

const isoTime = z.iso.datetime({ offset: true });
const serverMeta = {
  changeSeq: z.number().int().min(1),
  createdAt: isoTime,
  updatedAt: isoTime,
};
/** Pulled captured records: the capture wire shape plus what only the server knows. */
const captured = {
  ...serverMeta,
  /** An open sync conflict exists for this record (a reviewer will choose). */
  conflicted: z.boolean(),
};

export const PulledWalkSchema = WalkSchema.safeExtend(captured);
export const PulledStationSchema = StationSchema.safeExtend(captured);
export const PulledFieldReadingSchema = FieldReadingSchema.safeExtend({
  ...captured,
  /** |B| in tesla as the server computed it. */
  fieldT: z.number().nullable(),
  /** The record names a photo (photoObjectKey set) that has not reached the object store yet. */
  attachmentPending: z.boolean(),
});
export const PulledSweepSchema = SweepSchema.safeExtend({ ...captured, attachmentPending: z.boolean() });

const synced = { id: UuidSchema, organisationId: UuidSchema, revision: z.number().int().min(1), deleted: z.boolean(), ...serverMeta };

export const PulledSurveySchema = z.object({
  ...synced,
  siteId: UuidSchema,
  name: z.string(),
  state: SurveyStateSchema,
  zoneSetId: UuidSchema.nullable(),
  startsOn: z.iso.date().nullable(),
  endsOn: z.iso.date().nullable(),
  species: z.array(SpeciesSchema),
  maxHarmonic: z.number().int(),
  repeatRadiusM: z.number().positive(),
  notes: z.string().nullable(),
  submittedAt: isoTime.nullable(),
  submittedByUserId: UuidSchema.nullable(),
  signedOffAt: isoTime.nullable(),
  signedOffByUserId: UuidSchema.nullable(),
  reportSha256: z.string().nullable(),
});
export const PulledSurveyAssignmentSchema = z.object({ ...synced, surveyId: UuidSchema, userId: UuidSchema, role: AssignmentRoleSchema });

/** A reviewer's verdict on a reading or sweep; `remeasure` is a request back to the surveyors. */
export const PulledDecisionSchema = z.object({
  ...synced,
  surveyId: UuidSchema,
  fieldReadingId: UuidSchema.nullable(),
  sweepId: UuidSchema.nullable(),
  verdict: VerdictSchema,
  note: z.string().nullable(),
  reviewerUserId: UuidSchema,
  decidedAt: isoTime,
});

export const PulledWatchBandSchema = z.object({
  ...synced,
  siteId: UuidSchema.nullable(),
  name: z.string(),
  lowerHz: z.number(),
  upperHz: z.number(),
  reason: z.string(),
  source: z.string(),
  severity: SeveritySchema,
  thresholdDbWPerM2Hz: z.number().nullable(),
  starter: z.boolean(),
  notes: z.string().nullable(),
});

export const PulledZoneSetSchema = z.object({
  ...synced,
  name: z.string(),
  edition: z.string(),
  thresholds: z.array(z.object({ name: z.string(), fieldT: z.number(), caution: z.string() })),
  isDefault: z.boolean(),
  notes: z.string().nullable(),
});

export const PulledFlagSchema = z.object({
  ...synced,
  surveyId: UuidSchema,
  kind: FlagKindSchema,
  state: FlagStateSchema,
  severity: SeveritySchema,
  fingerprint: z.string(),
  roomId: UuidSchema.nullable(),
  stationId: UuidSchema.nullable(),
  watchBandId: UuidSchema.nullable(),
  species: SpeciesSchema.nullable(),
  harmonic: z.number().int().nullable(),
  overlapLowerHz: z.number().nullable(),
  overlapUpperHz: z.number().nullable(),
  details: z.record(z.string(), z.unknown()),
  acknowledgedAt: isoTime.nullable(),
  acknowledgedByUserId: UuidSchema.nullable(),
  acknowledgementNote: z.string().nullable(),
  resolvedAt: isoTime.nullable(),
  resolvedByUserId: UuidSchema.nullable(),
  resolution: z.string().nullable(),
});

/** What a pull carries, by entity (SQL table name, as in change_log). */
export const PULLED_RECORD_SCHEMAS = {
  surveys: PulledSurveySchema,
  survey_assignments: PulledSurveyAssignmentSchema,
  walks: PulledWalkSchema,
  stations: PulledStationSchema,
  field_readings: PulledFieldReadingSchema,
  sweeps: PulledSweepSchema,
  decisions: PulledDecisionSchema,
  flags: PulledFlagSchema,
  watch_bands: PulledWatchBandSchema,
  zone_sets: PulledZoneSetSchema,
} as const;
export type PulledEntity = keyof typeof PULLED_RECORD_SCHEMAS;
export const PULLED_ENTITIES = Object.keys(PULLED_RECORD_SCHEMAS) as [PulledEntity, ...PulledEntity[]];

export const PullChangeSchema = z.discriminatedUnion(
  'entity',
  PULLED_ENTITIES.map((entity) => z.object({ seq: z.number().int().min(1), entity: z.literal(entity), record: PULLED_RECORD_SCHEMAS[entity] })) as unknown as [
    z.ZodObject<{ seq: z.ZodNumber; entity: z.ZodLiteral<PulledEntity>; record: z.ZodType<Record<string, unknown>> }>,
  ],
);
export type PullChange = { seq: number; entity: PulledEntity; record: Record<string, unknown> };

export const PullResponseSchema = z.object({
  changes: z.array(PullChangeSchema),
  nextCursor: z.string(),
  hasMore: z.boolean(),
});
export type PullResponse = { changes: PullChange[]; nextCursor: string; hasMore: boolean };

// ----------------------------------------------------------------------------------------- conflicts

export const CONFLICT_KINDS = ['edit_vs_edit', 'edit_vs_delete', 'delete_vs_edit'] as const;
export const ConflictKindSchema = z.enum(CONFLICT_KINDS);

export const SyncConflictSchema = z.object({
  id: UuidSchema,
  surveyId: UuidSchema,
  entity: z.string(),
  recordId: UuidSchema,
  /** edit_vs_edit: two edits from one base; edit_vs_delete: an edit reached a tombstone (the edit was
   * kept, the record revived); delete_vs_edit: a deletion reached an edited record (the edit was kept). */
  kind: ConflictKindSchema,
  state: z.enum(['open', 'resolved']),
  serverRevision: z.number().int(),
  serverVersion: z.record(z.string(), z.unknown()),
  incomingBaseRevision: z.number().int(),
  incomingVersion: z.record(z.string(), z.unknown()),
  /** The record as it stands now on the server. */
  currentRevision: z.number().int().nullable(),
  mutationId: UuidSchema,
  deviceId: z.string(),
  userId: UuidSchema.nullable(),
  createdAt: isoTime,
  resolvedAt: isoTime.nullable(),
  resolvedByUserId: UuidSchema.nullable(),
  resolution: z.enum(['server', 'incoming']).nullable(),
  resolutionNote: z.string().nullable(),
  resolvedRevision: z.number().int().nullable(),
});
export type SyncConflict = z.infer<typeof SyncConflictSchema>;

export const ConflictListQuerySchema = z.object({
  surveyId: UuidSchema.optional(),
  state: z.enum(['open', 'resolved', 'all']).default('open'),
});
export const ConflictListSchema = z.object({ conflicts: z.array(SyncConflictSchema) });

export const ConflictParamsSchema = z.object({ orgId: UuidSchema, conflictId: UuidSchema });

/**
 * `server` keeps the version the server holds now (for edit_vs_delete: the deletion), `incoming` the
 * device's (for edit_vs_delete: the edit, which the record already shows). Either way the record gets a
 * new revision and change sequence, so every device pulls the outcome.
 */
export const ResolveConflictSchema = z.object({
  choose: z.enum(['server', 'incoming']),
  note: z.string().trim().max(2000).optional(),
});
export type ResolveConflict = z.infer<typeof ResolveConflictSchema>;

export const ResolveConflictResultSchema = z.object({
  conflict: SyncConflictSchema,
  revision: z.number().int().min(1),
  changeSeq: z.number().int().min(1),
});

// ------------------------------------------------------------------------------------------- repeats

export const RepeatGroupSchema = z.object({
  /** sha256 of the sorted member reading ids: the fingerprint of its flag. */
  fingerprint: z.string(),
  levelId: UuidSchema,
  readingIds: z.array(UuidSchema),
  stationIds: z.array(UuidSchema),
  count: z.number().int().min(2),
  meanT: z.number(),
  /** Sample standard deviation (n − 1), tesla. */
  spreadT: z.number(),
  minT: z.number(),
  maxT: z.number(),
  /** Largest pairwise Eₙ (ISO 13528), with the pair. */
  maxEn: z.number().nullable(),
  worstPair: z.tuple([UuidSchema, UuidSchema]).nullable(),
  disagree: z.boolean(),
  /** The open repeat_disagreement flag raised for this group, when it disagrees. */
  flagId: UuidSchema.nullable(),
});
export type RepeatGroupView = z.infer<typeof RepeatGroupSchema>;

export const RepeatListSchema = z.object({
  surveyId: UuidSchema,
  radiusM: z.number().positive(),
  /** Coverage factor used to expand instrument uncertainties, and the default when an instrument gives none. */
  coverageFactor: z.number(),
  defaultRelativeStandardUncertainty: z.number(),
  groups: z.array(RepeatGroupSchema),
});

// --------------------------------------------------------------------------------------- attachments

export const ATTACHMENT_KINDS = ['photo', 'trace'] as const;
export const AttachmentKindSchema = z.enum(ATTACHMENT_KINDS);
/** Largest attachment accepted, bytes (photos are resized on the device; traces are CSV). */
export const ATTACHMENT_MAX_BYTES = 20 * 1024 * 1024;

export const AttachmentParamsSchema = z.object({ orgId: UuidSchema, recordId: UuidSchema, kind: AttachmentKindSchema });

/**
 * PUT answer: 201 when the file was stored now, 200 when it was already there (a retry). Uploads are
 * whole-file and idempotent by SHA-256: an interrupted upload stores nothing, and sending the whole file
 * again completes it (no Content-Range chunks).
 */
export const AttachmentUploadResultSchema = z.object({
  objectKey: z.string(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  bytes: z.number().int().min(0),
  contentType: z.string(),
  alreadyStored: z.boolean(),
});
export type AttachmentUploadResult = z.infer<typeof AttachmentUploadResultSchema>;
