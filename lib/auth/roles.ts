/**
 * Roles and what each may do. Pure data: used by the server to authorise and by the UI to
 * decide what to show (the server check is the one that counts).
 */
export const ROLES = ["admin", "analyst", "referee", "member"] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  "users:manage",
  "sites:manage",
  "datasets:read",
  "datasets:upload",
  "datasets:unblind",
  "analyses:run",
  "analyses:publish",
  "analyses:read-own",
  "analyses:read-shared",
  "analyses:read-published",
  "analyses:reproduce",
  "alerts:subscribe",
  "audit:read",
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  // Administrators run the instance: people and sites, and read the audit log.
  admin: ["users:manage", "sites:manage", "datasets:read", "analyses:read-published", "alerts:subscribe", "audit:read"],
  // Analysts bring data and run, share and publish analyses.
  analyst: [
    "sites:manage",
    "datasets:read",
    "datasets:upload",
    "datasets:unblind",
    "analyses:run",
    "analyses:publish",
    "analyses:read-own",
    "analyses:read-shared",
    "analyses:read-published",
    "analyses:reproduce",
    "alerts:subscribe",
    "audit:read",
  ],
  // Referees read what was shared with them and rerun it; nothing else.
  referee: ["analyses:read-shared", "analyses:reproduce", "alerts:subscribe"],
  // Members read published results and subscribe to alerts.
  member: ["analyses:read-published", "alerts:subscribe"],
};

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Administrator",
  analyst: "Analyst",
  referee: "Referee",
  member: "Member",
};

/** True when the role grants the permission. */
export function can(role: Role, permission: Permission): boolean {
  return ROLE_PERMISSIONS[role].includes(permission);
}

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
