import { describe, expect, it } from "vitest";
import { can, isRole, PERMISSIONS, ROLES } from "@/lib/auth/roles";

describe("roles and permissions", () => {
  it("gives referees only reading shared analyses, reproducing them and alerts", () => {
    const granted = PERMISSIONS.filter((p) => can("referee", p));
    expect(granted).toEqual(["analyses:read-shared", "analyses:reproduce", "alerts:subscribe"]);
  });

  it("gives members only published results and alerts", () => {
    expect(PERMISSIONS.filter((p) => can("member", p))).toEqual(["analyses:read-published", "alerts:subscribe"]);
  });

  it("reserves user management to administrators and data upload to analysts", () => {
    for (const role of ROLES) {
      expect(can(role, "users:manage")).toBe(role === "admin");
      expect(can(role, "datasets:upload")).toBe(role === "analyst");
      expect(can(role, "analyses:run")).toBe(role === "analyst");
    }
  });

  it("recognises exactly the four roles", () => {
    expect(ROLES.every(isRole)).toBe(true);
    expect(isRole("root")).toBe(false);
    expect(isRole(undefined)).toBe(false);
  });
});
