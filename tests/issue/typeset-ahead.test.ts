// Typesetting a revision's formulas ahead of rendering, in this thread and a worker thread at once
// (lib/issue/pdf/typeset-ahead.ts): every formula typeset either way is exactly the one the renderer
// would have made itself (common practice: a cache filled by another thread must not change what is
// drawn).
import { describe, expect, it } from 'vitest';
import { createTexCache, typesetTex } from '../../lib/issue/pdf/tex-svg';
import { startTypesetWorker, statementFormulas, typesetAhead } from '../../lib/issue/pdf/typeset-ahead';
import { buildRevisionPdfData, generatedCells } from './pdf-fixture';

describe('typesetting ahead in two threads', () => {
  it('shares the formulas of a 200-cell revision with the worker, each identical to one typeset here', async () => {
    await startTypesetWorker();
    const data = buildRevisionPdfData({ cells: generatedCells(200) });
    // Values no other test uses, so that none of these formulas is cached yet.
    const formulas = statementFormulas(data).map(([tex, display]): [string, boolean] => [
      tex.replace(/(\d)\.(\d)/g, '$1.$2\\,\\!'),
      display,
    ]);
    expect(formulas.length).toBeGreaterThan(500);
    const counts = await typesetAhead(formulas);
    expect(counts.worker).toBeGreaterThan(0);
    expect(counts.here).toBeGreaterThan(0);
    const distinct = new Set(formulas.map(([t, d]) => `${d}${t}`)).size;
    expect(counts.worker + counts.here).toBe(distinct);
    const cached = createTexCache();
    for (const [tex, display] of formulas.filter((_, i) => i % 7 === 0)) {
      expect(JSON.stringify(cached(tex, display))).toBe(JSON.stringify(typesetTex(tex, display)));
    }
  }, 120_000);

  it('typesets nothing again that is typeset already, and leaves a short list to the renderer', async () => {
    const data = buildRevisionPdfData({ cells: generatedCells(40) });
    const formulas = statementFormulas(data);
    await typesetAhead(formulas);
    expect(await typesetAhead(formulas)).toEqual({ here: 0, worker: 0 });
    expect(await typesetAhead([['x_{1} = 2', true]])).toEqual({ here: 0, worker: 0 });
  }, 120_000);
});
