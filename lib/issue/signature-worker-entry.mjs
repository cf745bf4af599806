// Entry of the signature parser's worker thread. Plain JavaScript so that Node can start it directly
// in any host (the Next.js server, the tests); it loads the TypeScript through tsx, as the
// calculation sandbox's worker does.
import { register } from 'tsx/esm/api';

register();
await import('./signature-worker.ts');
