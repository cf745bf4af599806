import { createHash } from 'node:crypto';
import { expect, it } from 'vitest';
import { canonicalContent, contentHash } from '../../lib/sheets/content-hash';
import { sampleContent } from '../support/fixtures';

it('serialises content per RFC 8785 (keys sorted by UTF-16 code units, no whitespace)', () => {
  const text = canonicalContent(sampleContent('A'));
  expect(text.startsWith('{"attachments":[],"cells":[{"id":"c1","kind":"calc","source":"x = 2 m"}],"record":{')).toBe(true);
  expect(text).not.toMatch(/\s":|,\s/);
});

it('gives the same hash whatever order the keys were written in, and another for other content', () => {
  const a = sampleContent('Same');
  const reordered = JSON.parse(JSON.stringify({ title: a.title, cells: a.cells, schema: a.schema, record: a.record, attachments: a.attachments, safetyRelated: a.safetyRelated, significantFigures: a.significantFigures }));
  expect(contentHash(reordered)).toBe(contentHash(a));
  expect(contentHash(sampleContent('Other'))).not.toBe(contentHash(a));
  expect(contentHash(a)).toBe(createHash('sha256').update(canonicalContent(a)).digest('hex'));
});
