import type { ROLE_NAMES } from '../../shared/schema/auth';

export type Role = (typeof ROLE_NAMES)[number];
