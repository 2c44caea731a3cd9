/** The four team roles, weakest first. Each role may do everything the ones before it may. */
export const ROLES = ["viewer", "engineer", "checker", "admin"] as const;
export type Role = (typeof ROLES)[number];

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

export function roleAtLeast(role: Role, minimum: Role): boolean {
  return ROLES.indexOf(role) >= ROLES.indexOf(minimum);
}

export const ROLE_LABELS: Record<Role, string> = {
  viewer: "Viewer — reads everything in the team",
  engineer: "Engineer — writes calc sheets",
  checker: "Checker — writes and verifies others' sheets",
  admin: "Admin — manages members, roles and invitations",
};
