import { createHash } from 'node:crypto';
import { expect, it } from 'vitest';
import { canonicalContent, contentHash } from '../../lib/sheets/content-hash';
import { sampleContent } from '../support/fixtures';

it('serialises content per RFC 8785 (keys sorted by UTF-16 code units, no whitespace)', () => {
  const text = canonicalContent(sampleContent('A'));
  expect(text.startsWith('{"attachments":[],"cells":[{"id":"c1","kind":"calc","source":"x = 2 m"}],"record":{')).toBe(
    true,
  );
  expect(text).not.toMatch(/\s":|,\s/);
});

it('gives the same hash whatever order the keys were written in, and another for other content', () => {
  const a = sampleContent('Same');
  const reordered = JSON.parse(
    JSON.stringify({
      title: a.title,
      cells: a.cells,
      schema: a.schema,
      record: a.record,
      attachments: a.attachments,
      safetyRelated: a.safetyRelated,
      significantFigures: a.significantFigures,
    }),
  );
  expect(contentHash(reordered)).toBe(contentHash(a));
  expect(contentHash(sampleContent('Other'))).not.toBe(contentHash(a));
  expect(contentHash(a)).toBe(createHash('sha256').update(canonicalContent(a)).digest('hex'));
});

it('keeps the hash of a version saved before the display-units setting existed: the field stays absent, read as SI', async () => {
  const { versionContentSchema } = await import('../../lib/sheets/content');
  const { DISPLAY_UNITS_DEFAULT } = await import('../../lib/calc/display-units');
  const stored = sampleContent('Before the setting');
  expect('displayUnits' in stored).toBe(false);
  // The hash as it was computed when the version was saved, from the stored JSON itself.
  const before = createHash('sha256')
    .update(canonicalContent(JSON.parse(JSON.stringify(stored))))
    .digest('hex');
  const parsed = versionContentSchema.parse(JSON.parse(JSON.stringify(stored)));
  expect('displayUnits' in parsed).toBe(false);
  expect(contentHash(parsed)).toBe(before);
  expect(DISPLAY_UNITS_DEFAULT).toBe('si');
  // The setting is part of the content: choosing it makes another version.
  const trade = versionContentSchema.parse({ ...stored, displayUnits: 'trade' });
  expect(contentHash(trade)).not.toBe(before);
  expect(contentHash(versionContentSchema.parse({ ...stored, displayUnits: 'si' }))).not.toBe(before);
  expect(versionContentSchema.safeParse({ ...stored, displayUnits: 'imperial' }).success).toBe(false);
});
