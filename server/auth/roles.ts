/**
 * Who may do what. Each role includes the ones below it:
 * - viewer: watch the live board and read the log;
 * - crew: also acknowledge alerts;
 * - competent-person: also edit the site, structures, levels and actions, sensors and gateways,
 *   and hand out site links;
 * - admin: also manage people and their roles.
 */
export const roles = ['viewer', 'crew', 'competent-person', 'admin'] as const;
export type Role = (typeof roles)[number];

const rank: Readonly<Record<Role, number>> = { viewer: 0, crew: 1, 'competent-person': 2, admin: 3 };

export function roleAllows(held: Role, needed: Role): boolean {
  return rank[held] >= rank[needed];
}

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (roles as readonly string[]).includes(value);
}
