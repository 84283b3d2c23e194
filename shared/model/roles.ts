/** Studio roles, weakest first: viewers read, editors change looks and artworks, owners manage people. */
export const ROLES = ['viewer', 'editor', 'owner'] as const;
export type Role = (typeof ROLES)[number];

/** True when `role` grants at least what `minimum` grants. */
export function roleAtLeast(role: Role | null | undefined, minimum: Role): boolean {
  return role != null && ROLES.indexOf(role) >= ROLES.indexOf(minimum);
}
