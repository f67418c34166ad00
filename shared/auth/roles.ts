/** Roles in increasing order of authority; each role may do everything the ones before it may. */
export const ROLES = ['viewer', 'operator', 'lead', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** True when `role` carries at least the authority of `required`. */
export function hasRole(role: Role, required: Role): boolean {
  return ROLES.indexOf(role) >= ROLES.indexOf(required);
}
