// The role table of product.md ("Who uses it"), checked permission by permission, and the
// deny-by-default rule for anything not in the table.
import { describe, expect, it } from "vitest";
import { can, PERMISSIONS, ROLES, rolesWith, type Permission } from "~/lib/auth/permissions";

// product.md: admin manages users/roles and sees everything; engineer creates projects,
// uploads, queues and cancels; checker reads and reviews; viewer reads.
const EXPECTED: Record<(typeof ROLES)[number], Permission[]> = {
  admin: [...PERMISSIONS],
  engineer: ["read:project", "read:model", "read:job", "create:project", "create:model", "create:job", "cancel:job:own", "manage:apikey:own", "read:catalogue", "manage:catalogue"],
  checker: ["read:project", "read:model", "read:job", "review:job", "manage:apikey:own", "read:catalogue"],
  viewer: ["read:project", "read:model", "read:job", "manage:apikey:own", "read:catalogue"],
};

describe("permissions", () => {
  it.each(ROLES)("%s holds exactly its permissions", (role) => {
    const held = PERMISSIONS.filter((p) => can(role, p));
    expect(new Set(held)).toEqual(new Set(EXPECTED[role]));
  });

  it("only checkers and admins review; nobody but admins manages users or reads the audit", () => {
    expect(rolesWith("review:job")).toEqual(["admin", "checker"]);
    expect(rolesWith("manage:users")).toEqual(["admin"]);
    expect(rolesWith("read:audit")).toEqual(["admin"]);
    expect(rolesWith("cancel:job:any")).toEqual(["admin"]);
  });

  it("denies by default: unknown roles, missing roles and unknown permissions get nothing", () => {
    for (const p of PERMISSIONS) {
      expect(can("superuser", p)).toBe(false);
      expect(can(null, p)).toBe(false);
      expect(can(undefined, p)).toBe(false);
      expect(can("", p)).toBe(false);
    }
    expect(can("admin", "delete:everything" as Permission)).toBe(false);
    // prototype keys are not roles
    expect(can("constructor", "read:job")).toBe(false);
    expect(can("__proto__", "read:job")).toBe(false);
  });
});
