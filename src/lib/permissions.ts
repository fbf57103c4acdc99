import type { Role } from '@shared/schemas/auth.schema';

// The client only hides what a role cannot do; the server enforces every rule.

export const ROLE_LABELS: Record<Role, string> = {
  drafter: 'Drafter',
  engineer: 'Engineer',
  reviewer: 'Reviewer',
  admin: 'Admin',
};

export function canManageProjects(role: Role | undefined): boolean {
  return role === 'engineer' || role === 'admin';
}

export function canAddTrusses(role: Role | undefined): boolean {
  return role === 'drafter' || role === 'engineer' || role === 'admin';
}

export function isAdmin(role: Role | undefined): boolean {
  return role === 'admin';
}

/** Drafters and engineers send drawings and re-import them; reviewers and admins read them. */
export function canUploadDrawings(role: Role | undefined): boolean {
  return role === 'drafter' || role === 'engineer';
}
