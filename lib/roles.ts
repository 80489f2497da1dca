// Role names used by the app's navigation and the server's policies. `admin` is never offered at sign-up:
// it is granted only by the seed or the operator command in scripts/.
export const SIGNUP_ROLES = ['grower', 'grazier'] as const;
export const ROLES = [...SIGNUP_ROLES, 'admin'] as const;

export type SignupRole = (typeof SIGNUP_ROLES)[number];
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  grower: 'Grower',
  grazier: 'Grazier',
  admin: 'Operator',
};

export function isSignupRole(value: unknown): value is SignupRole {
  return typeof value === 'string' && (SIGNUP_ROLES as readonly string[]).includes(value);
}
