// Entry of the formula typesetting worker thread (typeset-ahead.ts). Plain JavaScript so that Node
// can start it directly in any host; it loads the TypeScript through tsx, as the calculation
// sandbox's and the signature parser's workers do.
import { register } from 'tsx/esm/api';

register();
await import('./typeset-worker.ts');
