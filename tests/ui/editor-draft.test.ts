// The editor's kept draft (components/sheet/editor-draft.ts): kept only while it differs from the
// version it is based on, so a clean save leaves nothing to restore, and offered back only when it
// differs from the version the editor opens on.
import { describe, expect, it } from 'vitest';
import { draftKey, keepDraft, readDraft, sameContent } from '../../components/sheet/editor-draft';
import { emptyRecord, type VersionContent } from '../../lib/sheets/content';

/** A Storage kept in a Map (the unit tier runs without a browser). */
function memoryStorage(): Storage {
  const items = new Map<string, string>();
  return {
    get length() {
      return items.size;
    },
    clear: () => items.clear(),
    getItem: (key) => items.get(key) ?? null,
    key: (i) => [...items.keys()][i] ?? null,
    removeItem: (key) => void items.delete(key),
    setItem: (key, value) => void items.set(key, value),
  };
}

const content = (source: string): VersionContent => ({
  schema: 1,
  title: 'Time of flight',
  safetyRelated: false,
  significantFigures: 6,
  displayUnits: 'si',
  record: emptyRecord(),
  cells: [{ id: 'tof', kind: 'calc', source }],
  attachments: [],
});

const SHEET = 'sheet-1';

describe('the kept draft', () => {
  it('is the same content whatever order its keys were written in, and whether an absent field is undefined', () => {
    const a = content('d = 12.5 m');
    const { cells, title, ...rest } = a;
    const reordered = { cells, ...rest, title, displayUnits: undefined } as unknown as VersionContent;
    const { displayUnits: _shown, ...withoutUnits } = a;
    expect(sameContent({ ...reordered, displayUnits: 'si' }, a)).toBe(true);
    expect(sameContent(reordered, withoutUnits as VersionContent)).toBe(true);
    expect(sameContent(a, content('d = 12.6 m'))).toBe(false);
  });

  it('is not kept after a clean save: the content saved is the version, nothing remains to restore', () => {
    const storage = memoryStorage();
    const v2 = content('d = 12.5 m');
    const edited = content('d = 13 m');
    keepDraft(storage, SHEET, { parentNumber: 2, content: edited }, { number: 2, content: v2 });
    expect(storage.getItem(draftKey(SHEET))).not.toBeNull();
    // Saved as version 3: the editor now holds version 3's content, based on version 3.
    keepDraft(storage, SHEET, { parentNumber: 3, content: edited }, { number: 3, content: edited });
    expect(storage.getItem(draftKey(SHEET))).toBeNull();
    expect(readDraft(storage, SHEET, { number: 3, content: edited })).toBeNull();
  });

  it('is removed when the edits are undone by hand', () => {
    const storage = memoryStorage();
    const v2 = content('d = 12.5 m');
    keepDraft(storage, SHEET, { parentNumber: 2, content: content('d = 1') }, { number: 2, content: v2 });
    keepDraft(storage, SHEET, { parentNumber: 2, content: content('d = 12.5 m') }, { number: 2, content: v2 });
    expect(storage.getItem(draftKey(SHEET))).toBeNull();
  });

  it('is restored only when based on the version opened (or later) and different from it; any other is thrown away', () => {
    const v2 = content('d = 12.5 m');
    const edited = content('d = 13 m');
    const kept = (parentNumber: number, c: VersionContent) => {
      const storage = memoryStorage();
      storage.setItem(draftKey(SHEET), JSON.stringify({ parentNumber, content: c, savedAt: '2026-12-05T17:00:00Z' }));
      return storage;
    };
    // Different from version 2: restored, and still kept.
    let storage = kept(2, edited);
    expect(readDraft(storage, SHEET, { number: 2, content: v2 })?.content).toEqual(edited);
    expect(storage.getItem(draftKey(SHEET))).not.toBeNull();
    // The same as version 2 (a draft kept by an older editor after a clean save): not restored, removed.
    storage = kept(2, v2);
    expect(readDraft(storage, SHEET, { number: 2, content: v2 })).toBeNull();
    expect(storage.getItem(draftKey(SHEET))).toBeNull();
    // Based on a version older than the one opened: removed.
    storage = kept(1, edited);
    expect(readDraft(storage, SHEET, { number: 2, content: v2 })).toBeNull();
    expect(storage.getItem(draftKey(SHEET))).toBeNull();
    // Unreadable: removed.
    storage = memoryStorage();
    storage.setItem(draftKey(SHEET), '{not json');
    expect(readDraft(storage, SHEET, { number: 2, content: v2 })).toBeNull();
    expect(storage.getItem(draftKey(SHEET))).toBeNull();
  });
});
