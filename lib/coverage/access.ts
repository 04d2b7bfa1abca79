/**
 * Who may do what with coverage. The planner and the coverage API show no data, so every
 * signed-in role may use them and read saved configurations; analysts and administrators
 * save, edit and delete configurations (analysts build analyses on them, administrators look
 * after the instance). Kept beside the feature rather than in lib/auth/roles.ts; the server
 * checks it in every handler and action.
 */
import type { Role } from "@/lib/auth/roles";

export const COVERAGE_SAVE_ROLES: readonly Role[] = ["admin", "analyst"];

/** True when the role may save, edit or delete coverage configurations. */
export function canSaveCoverage(role: Role): boolean {
  return COVERAGE_SAVE_ROLES.includes(role);
}
