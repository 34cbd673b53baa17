/** Who is writing, passed from the router through the service to the repository's audit row. */
export interface AuditContext {
  actorUserId: string | null;
  requestId?: string;
}
