// Who may do what, as data. A permission reads action:entity[:scope]; a role holds a list of
// them and anything not listed is denied. Pure module: pages may import it to hide buttons,
// but only the server's requirePermission decides.
export const ROLES = ["admin", "engineer", "checker", "viewer"] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  "read:project",
  "create:project",
  "create:model",
  "read:model",
  "create:job",
  "cancel:job:own",
  "cancel:job:any",
  "review:job",
  "read:job",
  "manage:users",
  "read:audit",
  "manage:apikey:own",
  "manage:apikey:any",
  "read:catalogue",
  "manage:catalogue",
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const READ: Permission[] = ["read:project", "read:model", "read:job", "read:catalogue"];

// product.md, "Who uses it": admin sees and manages everything; engineers produce; checkers
// read and review; viewers read. Everyone may keep API keys of their own, which act with
// exactly their owner's role.
export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  admin: PERMISSIONS,
  engineer: [...READ, "create:project", "create:model", "create:job", "cancel:job:own", "manage:apikey:own", "manage:catalogue"],
  checker: [...READ, "review:job", "manage:apikey:own"],
  viewer: [...READ, "manage:apikey:own"],
};

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  engineer: "Engineer",
  checker: "Checker",
  viewer: "Viewer",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

/** Deny by default: an unknown role or permission is never granted. */
export function can(role: Role | string | null | undefined, permission: Permission): boolean {
  if (!isRole(role)) return false;
  return ROLE_PERMISSIONS[role].includes(permission);
}

/** The roles holding a permission, for messages ("needs engineer or admin"). */
export function rolesWith(permission: Permission): Role[] {
  return ROLES.filter((r) => can(r, permission));
}
