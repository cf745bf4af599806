// Entry of an evaluation worker thread when no prebuilt worker matches the sources (worker-bundle.ts):
// plain JavaScript so that Node can start it directly in any host (the Next.js server, the
// command-line evaluator, the tests); it loads the TypeScript engine through tsx, as the project
// commands do.
import { register } from 'tsx/esm/api';

register();
await import('./worker.ts');
