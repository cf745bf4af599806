import 'server-only';
import type { ProjectRole } from '@/db/schema';
import { getDb } from '@/db';
import { requireActor, requireProjectRole, type ProjectAccess } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { getSheet } from './sheets';

/** A sheet and the caller's access to its project: 404 unless a member, 403 without `roles`. */
export async function requireSheetAccess(sheetId: string, roles?: readonly ProjectRole[]) {
  await requireActor();
  const sheet = await getSheet(getDb(), sheetId);
  if (!sheet) throw new AppError('not_found', 'No such sheet, or you are not a member of its project.');
  const access: ProjectAccess = await requireProjectRole(sheet.project_id, roles);
  return { ...access, sheet };
}
