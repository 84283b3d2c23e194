/** Studio roles, weakest first: viewers read, editors change looks and artworks, owners manage people. */
export const ROLES = ['viewer', 'editor', 'owner'] as const;
export type Role = (typeof ROLES)[number];
/** How a role reads in lists and labels. */
export const ROLE_LABELS: Readonly<Record<Role, string>> = { viewer: 'Viewer', editor: 'Editor', owner: 'Owner' };
/** How a role reads inside a sentence: "is now an editor". */
export const roleInSentence = (role: Role) => `${/^[aeiou]/.test(role) ? 'an' : 'a'} ${role}`;

/** True when `role` grants at least what `minimum` grants. */
export function roleAtLeast(role: Role | null | undefined, minimum: Role): boolean {
  return role != null && ROLES.indexOf(role) >= ROLES.indexOf(minimum);
}
