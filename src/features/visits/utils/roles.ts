import type { Role } from '@shared/schemas/enums';

/** Who records visits and radon tests: the technician on site, and an admin or manager entering them (as the API allows). */
export const FIELD_ROLES: readonly Role[] = ['technician', 'admin', 'manager'];
