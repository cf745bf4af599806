// Runs the Kysely migrations in migrations/ with Kysely's Migrator.
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Migrator, type Kysely, type Migration, type MigrationProvider, type MigrationResultSet } from 'kysely';

const migrationFolder = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', 'migrations');

/**
 * Kysely's FileMigrationProvider, with the import done here rather than inside node_modules: the
 * migrations are TypeScript, and only an import in our own code goes through the loader of
 * whoever runs it (tsx for the commands, Vite's module runner in the tests).
 */
class MigrationFolderProvider implements MigrationProvider {
  async getMigrations(): Promise<Record<string, Migration>> {
    const migrations: Record<string, Migration> = {};
    for (const file of (await fs.readdir(migrationFolder)).sort()) {
      if (!/\.(ts|mjs|js)$/.test(file) || file.endsWith('.d.ts')) continue;
      const module = (await import(/* @vite-ignore */ path.join(migrationFolder, file))) as Migration;
      migrations[file.replace(/\.[^.]+$/, '')] = module;
    }
    return migrations;
  }
}

function createMigrator(db: Kysely<any>): Migrator {
  return new Migrator({ db, provider: new MigrationFolderProvider() });
}

function report(result: MigrationResultSet, log: (line: string) => void): void {
  for (const r of result.results ?? []) {
    log(
      `migration ${r.migrationName}: ${r.status === 'Success' ? (r.direction === 'Up' ? 'applied' : 'reverted') : r.status}`,
    );
  }
  if (result.error) {
    const message = result.error instanceof Error ? result.error.message : String(result.error);
    throw new Error(`Migration failed: ${message}`);
  }
}

export async function migrateToLatest(db: Kysely<any>, log: (line: string) => void = () => undefined): Promise<void> {
  report(await createMigrator(db).migrateToLatest(), log);
}

export async function migrateDownAll(db: Kysely<any>, log: (line: string) => void = () => undefined): Promise<void> {
  const migrator = createMigrator(db);
  const { NO_MIGRATIONS } = await import('kysely');
  report(await migrator.migrateTo(NO_MIGRATIONS), log);
}
