/**
 * The one permission table. Server route guards and the client's menus both
 * read it; the route × role matrix test is generated from it.
 */
export const ROLES = ['administrator', 'trustee', 'actuary', 'communications', 'board'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  administrator: 'Scheme administrator',
  trustee: 'Trustee',
  actuary: 'Actuary',
  communications: 'Communications officer',
  board: 'Board reviewer',
};

export const PERMISSIONS = {
  'scheme:read': ['administrator', 'trustee', 'actuary', 'communications', 'board'],
  'people:manage': ['administrator'],
  'audit:read': ['administrator'],
  'funds:read': ['administrator', 'trustee', 'actuary', 'communications', 'board'],
  'funds:edit': ['actuary'],
  'assumptions:read': ['administrator', 'trustee', 'actuary', 'board'],
  'assumptions:edit': ['actuary'],
  'assumptions:approve': ['trustee'],
  'options:read': ['administrator', 'trustee', 'actuary', 'communications', 'board'],
  'options:edit': ['trustee'],
  /** Four-eyes: the server also refuses a trustee who last edited the version (or set). */
  'options:approve': ['trustee'],
  'members:read': ['administrator', 'trustee', 'actuary', 'communications'],
  'members:edit': ['trustee', 'actuary'],
  'membership:upload': ['administrator', 'actuary'],
  'runs:read': ['trustee', 'actuary', 'communications', 'board'],
  'runs:create': ['trustee', 'actuary'],
  'reports:read': ['trustee', 'actuary', 'board'],
  'reports:create': ['trustee', 'actuary'],
  'statements:export': ['communications'],
  'settings:read': ['administrator', 'trustee', 'actuary', 'communications', 'board'],
  /**
   * Governance settings (approvals required, sign-off quorum, review interval, next review date)
   * are kept by the administrator on the board's instruction, not by trustees: the people the
   * four-eyes rule and the quorum bind cannot relax them on their own.
   */
  'settings:edit': ['administrator'],
  'reviews:read': ['administrator', 'trustee', 'actuary', 'board'],
  'reviews:edit': ['trustee'],
  'reviews:sign': ['trustee'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role | null | undefined, permission: Permission): boolean {
  return !!role && (PERMISSIONS[permission] as readonly Role[]).includes(role);
}
