/** Every role a Waymark user can hold; one role per user. */
export const ROLES = ['admin', 'engineer', 'lead', 'operator', 'stores', 'service'] as const
export type Role = (typeof ROLES)[number]

/** Human labels for the roles, used by the Admin screen and the sign-in banner. */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Manufacturing / test engineer',
  lead: 'Production lead',
  operator: 'Operator',
  stores: 'Stores / receiving',
  service: 'Customer service',
}
