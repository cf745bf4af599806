// The project roles, in a module with no server imports (client components may load it).
import type { ProjectRole } from '@/db/schema';

export const PROJECT_ROLES = [
  'originator',
  'checker',
  'approver',
  'controller',
  'viewer',
] as const satisfies readonly ProjectRole[];
