// The formula typesetting worker thread: typesets batches of TeX with the same code as the main
// thread (typesetOrNull in tex-svg.ts), so a formula typeset here is the one the main thread would
// have made. Messages: in { id, items: [tex, display][] }, out { type: 'done', id, results }.
import { parentPort } from 'node:worker_threads';
import { typesetOrNull } from './tex-svg';

parentPort!.on('message', (m: { id: number; items: Array<[string, boolean]> }) => {
  const results = m.items.map(([source, display]) => typesetOrNull(source, display));
  parentPort!.postMessage({ type: 'done', id: m.id, results });
});
parentPort!.postMessage({ type: 'ready' });
