// Builds the production app into a folder (argument; default .next-test) unless the build there is
// of the current sources (lib/ops/next-build.ts). `npm test` runs it beside the unit and database
// tiers, so that the browser tier, which serves that build, does not wait for it (lib/ops/test-tiers.ts).
import { inheritedEnvironment } from '../config';
import { buildIfStale } from './next-build';

buildIfStale(process.cwd(), process.argv[2] ?? '.next-test', { ...inheritedEnvironment(), NODE_ENV: 'production' });
