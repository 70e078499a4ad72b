import "server-only";
import { getDb } from "../connection";
import { auditLog } from "../schema";

export interface AuditInput {
  actorId: string | null;
  action: string;
  targetType: "chain" | "team" | "user" | "part" | "invitation";
  targetId?: string | null;
  teamId?: string | null;
  details?: Record<string, unknown>;
}

/** Append one line to the audit log; the log is only ever appended to. */
export function recordAudit(entry: AuditInput): void {
  getDb()
    .insert(auditLog)
    .values({
      actorId: entry.actorId,
      action: entry.action,
      targetType: entry.targetType,
      targetId: entry.targetId ?? null,
      teamId: entry.teamId ?? null,
      details: JSON.stringify(entry.details ?? {}),
    })
    .run();
}
