// `npm run -s audit -- verify`: walks the audit chain of the installation's database (DATABASE_URL, or
// the local demo cluster, started for the walk when the app is not running and stopped again after it).
// Prints one line on standard output; exit 0 when intact, 1 naming the first broken event, 2 when it
// cannot run. Notes about the cluster go to standard error, so the output stays that one line.
import { createDb } from '../../db/index';
import type { LocalCluster } from '../../db/local-postgres';
import { verifyAuditChain } from '../audit/verify';
import { localDatabaseUrl, type Stoppers } from './local-database';

export interface AuditCommandOptions {
  /** Another local cluster than the dev one (the tests' own). */
  cluster?: LocalCluster;
  out?: (text: string) => void;
  err?: (text: string) => void;
}

/** Runs the command and returns its exit code; what it started is left in `stoppers` to stop. */
export async function auditCommand(
  stoppers: Stoppers,
  args: string[],
  options: AuditCommandOptions = {},
): Promise<0 | 1 | 2> {
  const out = options.out ?? ((text: string) => process.stdout.write(text));
  const err = options.err ?? ((text: string) => process.stderr.write(text));
  if (args[0] !== 'verify') {
    err('usage: npm run -s audit -- verify\n');
    return 2;
  }
  let url: string;
  try {
    url = await localDatabaseUrl(stoppers, {
      create: false,
      cluster: options.cluster,
      log: (line) => err(`[worldsheet] ${line}\n`),
    });
  } catch (error) {
    err(`audit: cannot reach the database: ${(error as Error).message}\n`);
    return 2;
  }
  const db = createDb(url, { max: 1 });
  try {
    const report = await verifyAuditChain(db);
    if (report.ok) {
      out(`audit chain intact: ${report.events} events\n`);
      return 0;
    }
    out(
      `audit chain broken at event ${report.firstBroken!.id}: ${report.firstBroken!.problem} (${report.events} events read)\n`,
    );
    return 1;
  } catch (error) {
    err(`audit: cannot read the audit trail: ${(error as Error).message}\n`);
    return 2;
  } finally {
    await db.destroy();
  }
}
