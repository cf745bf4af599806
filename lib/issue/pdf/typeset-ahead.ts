// Typesets the formulas a revision's PDF will need before it is rendered, in two threads at once:
// this one and a worker thread kept for the process. MathJax is synchronous and costs about 2–4 ms
// a formula; a revision with new values brings hundreds of new formulas (every substituted one), and
// that was a third of the time to issue it. What either thread makes goes into the one cache the
// renderer reads (tex-svg.ts), keyed by the TeX and its display mode; the worker runs the same
// typesetOrNull, and numbers cross threads unchanged (structured clone), so the PDF is the same
// whichever thread typeset a formula. Anything not typeset ahead (a worker that failed or has not
// started yet, a formula the list missed) is typeset by the renderer as before.
import path from 'node:path';
import { LimitedWorker } from '@/lib/calc/sandbox/limited-worker';
import type { RevisionPdfData } from '../pdf-data';
import { internPathData } from './svg-path';
import { isTypeset, rememberTypeset, typesetKey, typesetOrNull, type TypesetMath } from './tex-svg';

const ENTRY = ['lib', 'issue', 'pdf', 'typeset-worker-entry.mjs'].join(path.sep);
// Formulas per message: small enough that the last batch does not keep the main thread waiting.
const BATCH = 24;
// Below this many new formulas a worker's round trips gain nothing.
const WORTH_IT = 2 * BATCH;
// The longest the main thread waits for the worker's last batch before leaving it to the renderer.
const LAST_BATCH_MS = 10_000;

type Reply = { type: 'ready' } | { type: 'done'; id: number; results: Array<TypesetMath | null> };

let thread: LimitedWorker<Reply> | null = null;
let waiting: { id: number; done: (results: Array<TypesetMath | null> | null) => void } | null = null;
let nextId = 1;
let running = false;

function worker(): LimitedWorker<Reply> {
  thread ??= new LimitedWorker<Reply>({
    entry: ENTRY,
    memoryMb: 256,
    youngMb: 16,
    label: 'typesetting worker',
    onMessage: (m) => {
      if (m.type === 'done' && waiting?.id === m.id) {
        const w = waiting;
        waiting = null;
        w.done(m.results);
      }
    },
    onCrash: () => {
      thread?.reset();
      const w = waiting;
      waiting = null;
      w?.done(null);
    },
  });
  return thread;
}

/** Starts the worker thread now rather than at the first revision worth it (resolves when it is ready). */
export function startTypesetWorker(): Promise<void> {
  return worker().start();
}

/** The worker's copies of glyph path data replaced by this thread's own (they are shared, not counted per formula). */
function shared(math: TypesetMath | null): TypesetMath | null {
  if (!math) return null;
  for (const item of math.items) if (item.kind === 'path') item.d = internPathData(item.d);
  return math;
}

/**
 * Typesets `formulas` ([TeX, display]) not typeset yet, sharing the work with the worker thread.
 * Resolves when every formula is typeset or left to the renderer; never rejects. One call at a
 * time: a call made while another runs returns at once (its formulas are typeset while rendering).
 * Returns how many formulas each thread typeset.
 */
export async function typesetAhead(formulas: Array<[string, boolean]>): Promise<{ here: number; worker: number }> {
  const counts = { here: 0, worker: 0 };
  if (running) return counts;
  const keys = new Set<string>();
  const todo: Array<[string, boolean]> = [];
  for (const [source, display] of formulas) {
    const key = typesetKey(source, display);
    if (keys.has(key) || isTypeset(key)) continue;
    keys.add(key);
    todo.push([source, display]);
  }
  if (todo.length < WORTH_IT) return counts;
  running = true;
  try {
    const batches: Array<Array<[string, boolean]>> = [];
    for (let i = 0; i < todo.length; i += BATCH) batches.push(todo.slice(i, i + BATCH));
    const t = worker();
    let ready = false;
    let inFlight: Promise<void> | null = null;
    // The worker takes batches from the end, this thread from the front.
    const dispatch = () => {
      if (!ready || inFlight || batches.length === 0) return;
      const batch = batches.pop()!;
      const id = nextId++;
      inFlight = new Promise<void>((resolve) => {
        waiting = {
          id,
          done: (results) => {
            if (results)
              batch.forEach(([source, display], i) => {
                rememberTypeset(typesetKey(source, display), shared(results[i]));
                counts.worker++;
              });
            inFlight = null;
            if (results) dispatch();
            else t.idle();
            resolve();
          },
        };
        t.post({ id, items: batch });
      });
    };
    t.start().then(
      () => {
        ready = true;
        dispatch();
      },
      () => undefined, // no worker: this thread typesets everything
    );
    while (batches.length) {
      for (const [source, display] of batches.shift()!) {
        rememberTypeset(typesetKey(source, display), typesetOrNull(source, display));
        counts.here++;
      }
      // Lets the worker's reply and the next dispatch through.
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
    const last = inFlight as Promise<void> | null;
    if (last) {
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([last, new Promise<void>((resolve) => (timer = setTimeout(resolve, LAST_BATCH_MS)))]);
      clearTimeout(timer);
    }
    t.idle();
    return counts;
  } finally {
    running = false;
  }
}

/** The displayed formulas of a revision's statements (TeX and substituted TeX), as the renderer typesets them. */
export function statementFormulas(data: RevisionPdfData): Array<[string, boolean]> {
  const out: Array<[string, boolean]> = [];
  for (const cell of data.version.results.cells)
    for (const st of cell.statements) {
      if (st.tex) out.push([st.tex, true]);
      if (st.substitutedTex && st.substitutedTex !== st.tex) out.push([st.substitutedTex, true]);
    }
  return out;
}
