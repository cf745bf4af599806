// @vitest-environment jsdom
// The physics lint's warnings as the app renders them beside a statement (editor, version view and
// check view all use StatementView) and counted on a cell under check: in words, not by colour alone
// (WCAG 2.2, 1.4.1), distinct from an error's alert, and nothing for results stored before warnings
// existed.
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { StatementView } from '../../components/calc/statement-view';
import { CheckCell } from '../../components/checks/check-cell';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellResult, StatementResult } from '../../lib/calc/types';
import type { CellComparison } from '../../lib/sheets/compare';

function dom(html: string): Document {
  return new DOMParser().parseFromString(`<!DOCTYPE html><body>${html}</body>`, 'text/html');
}

// A real engine result (issue 15: `h` here is the hour; common practice).
const engine = createSheetEngine();
const result = engine.evaluate([{ id: 'c1', kind: 'calc', source: 'x_1 = 2\nE_ph = h * c / (500 nm)' }], {
  significantFigures: 6,
}).cells[0];
const statement = result.statements[1];

describe('a statement with a warning', () => {
  const page = dom(renderToStaticMarkup(createElement(StatementView, { statement })));

  it('shows the warning as a labelled list item in words, with the names in the code face, and no alert', () => {
    const list = page.querySelector('ul[aria-label="Warnings, line 2"]')!;
    expect(list).not.toBeNull();
    const items = [...list.querySelectorAll('li')];
    expect(items.map((li) => li.textContent)).toEqual([
      'Warning, line 2: `h` here is the hour (a unit of time); the Planck constant is `h_P`'.replace(/`/g, ''),
    ]);
    expect([...items[0].querySelectorAll('code')].map((c) => c.textContent)).toEqual(['h', 'h_P']);
    // The caution colours, not the error's: an error is an alert, a warning is not.
    expect(items[0].className).toContain('text-caution');
    expect(page.querySelector('[role="alert"]')).toBeNull();
    // The statement still shows its value: a warning does not stop evaluation.
    expect(page.body.textContent).toContain(statement.value!.text);
  });

  it('shows nothing for a statement without warnings, or one stored before warnings existed', () => {
    const stored: StatementResult = { ...statement };
    delete stored.warnings;
    for (const s of [{ ...statement, warnings: [] }, stored]) {
      const html = renderToStaticMarkup(createElement(StatementView, { statement: s }));
      expect(html).not.toContain('Warning');
    }
  });
});

describe('a cell under check', () => {
  const render = (r: CellResult) =>
    dom(
      renderToStaticMarkup(
        createElement(CheckCell, {
          cell: {
            id: 'c1',
            kind: 'calc',
            status: 'unchanged',
            moved: false,
            baseKind: 'calc',
            baseIndex: 0,
            targetIndex: 0,
            sourceDiff: null,
          } satisfies CellComparison,
          label: 'Cell 1',
          source: 'x_1 = 2\nE_ph = h * c / (500 nm)',
          result: r,
          changes: [],
          baseNumber: null,
          first: true,
          renderText: () => null,
        }),
      ),
    );

  it('counts its warnings in the header and shows each beside its statement', () => {
    const page = render(result);
    expect(page.querySelector('article p')!.textContent).toContain('1 warning');
    expect(page.querySelector('ul[aria-label="Warnings, line 2"]')).not.toBeNull();
  });

  it('counts none for results stored before warnings existed', () => {
    const stored: CellResult = { ...result, statements: result.statements.map((s) => ({ ...s })) };
    delete stored.warnings;
    for (const s of stored.statements) delete s.warnings;
    const page = render(stored);
    expect(page.body.textContent).not.toContain('warning');
    expect(page.body.textContent).not.toContain('Warning');
  });
});
