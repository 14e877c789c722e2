/** Vocabulary shared by the database constraints, the API contracts and the client. */
export const ROLES = ['admin', 'manager', 'estimator', 'technician', 'sales'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  manager: 'Manager',
  estimator: 'Estimator',
  technician: 'Technician',
  sales: 'Sales',
};

export const FOUNDATIONS = ['slab', 'basement', 'crawlspace', 'mixed'] as const;
export type Foundation = (typeof FOUNDATIONS)[number];

export const PASSIVE_SYSTEM = ['yes', 'no', 'unknown'] as const;
export type PassiveSystem = (typeof PASSIVE_SYSTEM)[number];

export const PIPE_SIZES_IN = [3, 4] as const;

export const VISIT_STATUSES = ['completed', 'declined', 'no_access'] as const;
export const SUB_SLAB_MATERIALS = ['clean_gravel', 'mixed', 'none', 'unknown'] as const;
export const REWORK_REASONS = [
  'added_suction_point',
  'sealed_opening',
  'sealed_joint',
  'rerouted_pipe',
  'larger_fan',
  'other',
] as const;
export const TEST_KINDS = ['pre', 'post'] as const;
export const TEST_DEVICES = ['continuous_monitor', 'charcoal', 'alpha_track', 'electret'] as const;

export const OUTCOMES = [
  'not_visited',
  'awaiting_test',
  'below_action_level',
  'needs_rework',
  'reworked_below',
  'declined',
] as const;
export type Outcome = (typeof OUTCOMES)[number];

/** Who may see a home's owner/occupant contact (personal data): the roles that mail or quote homeowners. */
export const CONTACT_ROLES: readonly Role[] = ['admin', 'manager', 'estimator', 'sales'];
/** Who may create and edit builders, communities and homes. */
export const SURVEY_EDITOR_ROLES: readonly Role[] = ['admin', 'manager', 'estimator'];
/** Who records field work (visits, radon tests, their photos and lab reports). */
export const FIELD_ROLES: readonly Role[] = ['technician', 'admin', 'manager'];
