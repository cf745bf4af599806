// The linter enforces the architecture's walls (.lint/walls.mjs): each wall is shown broken by a small
// fixture linted as if it lived at the path it names, and kept by its allowed counterpart. The whole tree
// is linted by npm test's lint stage (lib/ops/test-tiers.ts), before the tiers, so `.ci/run` fails on a
// broken wall or a lint error (tests/lint/test-tiers.test.ts checks the stage is there).
import path from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const root = process.cwd();
const eslint = new ESLint({ cwd: root, overrideConfigFile: path.join(root, '.lint/eslint.config.mjs') });

async function wallMessages(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: path.join(root, filePath) });
  return result.messages.filter((m) => m.ruleId === 'worldsheet/walls' || m.fatal).map((m) => m.message);
}

describe('the walls between the layers', () => {
  it('lib/calc imports nothing of the project outside lib/calc', async () => {
    expect(
      await wallMessages('lib/calc/fixture.ts', "import { getDb } from '@/db';\nexport const x = getDb;\n"),
    ).toEqual([expect.stringContaining('lib/calc imports nothing of the project outside lib/calc')]);
    expect(
      await wallMessages(
        'lib/calc/functions/fixture.ts',
        "import { tokens } from '../../../tailwind.config';\nexport const t = tokens;\n",
      ),
    ).toHaveLength(1);
    expect(
      await wallMessages(
        'lib/calc/fixture.ts',
        "import { C } from './constants';\nimport { create } from 'mathjs';\nexport const x = [C, create];\n",
      ),
    ).toEqual([]);
  });

  it("a 'use client' module takes only types from server modules", async () => {
    const runtime = await wallMessages(
      'components/fixture.tsx',
      "'use client';\nimport { getDb } from '@/db';\nexport const x = getDb;\n",
    );
    expect(runtime).toEqual([expect.stringMatching(/reaches db\/index\.ts → (pg|kysely|node:)/)]);
    // Through a chain: lib/auth/current-actor reaches the database through its own imports.
    expect(
      await wallMessages(
        'components/fixture.tsx',
        "'use client';\nimport { requireActor } from '@/lib/auth/current-actor';\nexport const x = requireActor;\n",
      ),
    ).toEqual([expect.stringContaining('A client component takes only types from server modules')]);
    expect(
      await wallMessages('components/fixture.tsx', "'use client';\nimport pg from 'pg';\nexport const x = pg;\n"),
    ).toEqual([expect.stringContaining("may not import 'pg'")]);
    // Types are fine, and so is the same import in a server component.
    expect(
      await wallMessages(
        'components/fixture.tsx',
        "'use client';\nimport type { Actor } from '@/lib/auth/actor';\nexport type A = Actor;\n",
      ),
    ).toEqual([]);
    expect(
      await wallMessages('components/fixture.tsx', "import { getDb } from '@/db';\nexport const x = getDb;\n"),
    ).toEqual([]);
  });

  it('app/ never writes SQL', async () => {
    expect(
      await wallMessages(
        'app/api/fixture/route.ts',
        "import { getDb } from '@/db';\nexport async function GET() { return Response.json(await getDb().selectFrom('projects').selectAll().execute()); }\n",
      ),
    ).toEqual([expect.stringContaining("app/ never writes SQL: 'selectFrom'")]);
    expect(
      await wallMessages('app/fixture/page.tsx', "import { sql } from 'kysely';\nexport const q = sql`select 1`;\n"),
    ).toEqual([expect.stringContaining('app/ never writes SQL')]);
    expect(
      await wallMessages(
        'app/fixture/page.tsx',
        "import { getDb } from '@/db';\nimport { listMembers } from '@/lib/projects/projects';\nexport const q = () => listMembers(getDb(), 'x');\n",
      ),
    ).toEqual([]);
  });

  it('db/ imports lib/ only from the demo seed', async () => {
    const code = "import { contentHash } from '../lib/sheets/content-hash';\nexport const h = contentHash;\n";
    expect(await wallMessages('db/fixture.ts', code)).toEqual([
      expect.stringContaining('db/ imports lib/ only from the demo seed'),
    ]);
    expect(await wallMessages('db/seed.ts', code)).toEqual([]);
  });

  it('migrations import only kysely', async () => {
    expect(
      await wallMessages(
        'migrations/20990101T000000_fixture.ts',
        "import { z } from 'zod';\nimport type { Kysely } from 'kysely';\nexport const s = z;\nexport type K = Kysely<never>;\n",
      ),
    ).toEqual([expect.stringContaining("Migrations import only kysely ('zod')")]);
    expect(
      await wallMessages(
        'migrations/20990101T000000_fixture.ts',
        "import { contentHash } from '../lib/sheets/content-hash';\nexport const h = contentHash;\n",
      ),
    ).toHaveLength(1);
  });
});
