/** Who is writing, passed from the router through the service to the repository's audit row. */
export interface AuditContext {
  actorUserId: string | null;
  requestId?: string;
}

/** The audit context of a signed-in request (after guards.requireUser). */
export function auditContextOf(req: { user?: { id: string } | undefined; id?: unknown }): AuditContext {
  return { actorUserId: req.user?.id ?? null, requestId: String(req.id ?? '') };
}
