// Every fast-check property runs from a known seed (tests/calc/fast-check-seed.ts, or a seed passed to
// fc.assert), so a failure replays and a pass is the same run every time (common practice for
// property-based tests in CI).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { expect, it } from 'vitest';

function testFiles(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (name === '.artifacts' || name === 'node_modules') continue;
    if (statSync(p).isDirectory()) testFiles(p, out);
    else if (name.endsWith('.test.ts')) out.push(p);
  }
  return out;
}

it('every test file using fast-check seeds it', () => {
  const unseeded = testFiles(path.join(process.cwd(), 'tests'))
    .filter((file) => /from 'fast-check'/.test(readFileSync(file, 'utf8')))
    .filter((file) => {
      const source = readFileSync(file, 'utf8');
      if (source.includes('seedFastCheck(')) return false;
      const asserts = source.match(/fc\.(assert|check)\(/g)?.length ?? 0;
      const seeded = source.match(/\bseed:\s/g)?.length ?? 0;
      return asserts === 0 || seeded < asserts;
    })
    .map((file) => path.relative(process.cwd(), file));
  expect(unseeded).toEqual([]);
});
