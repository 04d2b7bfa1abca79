import "server-only";
import { getDb } from "@/lib/db";

export interface AuditInput {
  actorId: number | null;
  action: string;
  targetType: string;
  targetId?: string | number | null;
  details?: Record<string, unknown>;
}

/** Appends one entry to the audit log. */
export async function audit(entry: AuditInput): Promise<void> {
  await getDb().models.AuditEntry.create({
    actorId: entry.actorId,
    action: entry.action,
    targetType: entry.targetType,
    targetId: entry.targetId == null ? null : String(entry.targetId),
    details: entry.details ?? {},
  });
}

/** The latest entries, newest first, with the actor's name. */
export async function recentAudit(limit = 50) {
  const { AuditEntry, User } = getDb().models;
  return AuditEntry.findAll({
    order: [["id", "DESC"]],
    limit,
    include: [{ model: User, as: "actor", attributes: ["name", "email"] }],
  });
}
