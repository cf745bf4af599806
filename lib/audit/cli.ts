// `npm run -s audit -- verify`: walks the audit chain of the database named by DATABASE_URL (or the
// local demo cluster). Exit 0 when intact; 1 naming the first broken event; 2 when it cannot run.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createDb } from '@/db';
import { devClusterPort, LocalCluster } from '@/db/local-postgres';
import { config } from '@/lib/config';
import { verifyAuditChain } from './verify';

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

async function main(argv: string[]): Promise<number> {
  if (argv[0] !== 'verify') {
    process.stderr.write('usage: npm run -s audit -- verify\n');
    return 2;
  }
  let url = config().DATABASE_URL;
  if (!url) {
    const cluster = new LocalCluster({ name: 'dev', port: devClusterPort(), projectRoot: root, log: () => undefined });
    cluster.prepare();
    url = cluster.appUrl('worldsheet');
  }
  const db = createDb(url, { max: 1 });
  try {
    const report = await verifyAuditChain(db);
    if (report.ok) {
      process.stdout.write(`audit chain intact: ${report.events} events\n`);
      return 0;
    }
    process.stdout.write(
      `audit chain broken at event ${report.firstBroken!.id}: ${report.firstBroken!.problem} (${report.events} events read)\n`,
    );
    return 1;
  } catch (error) {
    process.stderr.write(`audit: cannot read the audit trail: ${(error as Error).message}\n`);
    return 2;
  } finally {
    await db.destroy();
  }
}

main(process.argv.slice(2)).then((code) => process.exit(code));
