// The editor's kept draft: unsaved edits are kept in this browser (localStorage) until saved, so a
// reload or a crashed tab loses nothing. A draft is only kept, and only offered back, while it differs
// from the version it is based on: after a clean save, or after editing back to what was saved, there
// is nothing to restore. Pure apart from the Storage given: client-safe.
import type { VersionContent } from '@/lib/sheets/content';

interface Draft {
  parentNumber: number;
  content: VersionContent;
  savedAt: string;
}

export const draftKey = (sheetId: string) => `worldsheet:draft:${sheetId}`;

/** JSON with every object's keys in order, so that two contents compare equal whatever order their keys were written in. */
function stableJson(value: unknown): string {
  return JSON.stringify(value, (_key, x: unknown) =>
    x && typeof x === 'object' && !Array.isArray(x)
      ? Object.fromEntries(Object.entries(x).sort(([p], [q]) => (p < q ? -1 : p > q ? 1 : 0)))
      : x,
  );
}

/** Whether two contents are the same (key order and absent versus undefined fields aside). */
export function sameContent(a: VersionContent, b: VersionContent): boolean {
  return stableJson(a) === stableJson(b);
}

/**
 * The draft to restore when the editor opens on version `base`: one based on that version (or a later
 * one) whose content differs from it. Any other kept draft (unreadable, older, or the same as the
 * version) is thrown away.
 */
export function readDraft(
  storage: Storage,
  sheetId: string,
  base: { number: number; content: VersionContent },
): Draft | null {
  const raw = storage.getItem(draftKey(sheetId));
  if (raw === null) return null;
  let draft: Draft | null = null;
  try {
    const parsed = JSON.parse(raw) as Draft;
    if (
      typeof parsed?.parentNumber === 'number' &&
      parsed.content &&
      parsed.parentNumber >= base.number &&
      !(parsed.parentNumber === base.number && sameContent(parsed.content, base.content))
    )
      draft = parsed;
  } catch {
    draft = null;
  }
  if (!draft) storage.removeItem(draftKey(sheetId));
  return draft;
}

/**
 * Keeps the editor's content as the sheet's draft when it differs from the saved version it is based
 * on, and removes the draft when it does not (a clean save, or edits undone by hand).
 */
export function keepDraft(
  storage: Storage,
  sheetId: string,
  edited: { parentNumber: number; content: VersionContent },
  saved: { number: number; content: VersionContent },
): void {
  if (edited.parentNumber === saved.number && sameContent(edited.content, saved.content)) {
    storage.removeItem(draftKey(sheetId));
    return;
  }
  const draft: Draft = { ...edited, savedAt: new Date().toISOString() };
  storage.setItem(draftKey(sheetId), JSON.stringify(draft));
}

/** Throws the kept draft away. */
export function discardDraft(storage: Storage, sheetId: string): void {
  storage.removeItem(draftKey(sheetId));
}
