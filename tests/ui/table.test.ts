// @vitest-environment jsdom
// The table kit (components/ui/table.tsx, components/ui/scroll-box.tsx): every table has a caption and header
// cells with their scope (WCAG 2.2 1.3.1); it sits in a box that scrolls sideways on its own, and that box
// becomes a keyboard-reachable, named region only while it actually scrolls (2.1.1, 4.1.2), so a table that
// fits adds no tab stop.
import { act, createElement as h } from 'react';
import { createRoot } from 'react-dom/client';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { overflows } from '../../components/ui/scroll-box';
import { Table, TABLE_CLASS, Td, Th } from '../../components/ui/table';

function sample(props: Partial<Omit<Parameters<typeof Table>[0], 'children'>> = {}) {
  return h(
    Table,
    { caption: 'Issued revisions of TPT2', ...props },
    h('thead', null, h('tr', null, h(Th, null, 'Sheet'), h(Th, { numeric: true }, 'Cells'))),
    h('tbody', null, h('tr', null, h(Th, { scope: 'row' }, 'TPT2-CALC-0001'), h(Td, { numeric: true }, '12'))),
  );
}

describe('the markup', () => {
  it('gives the table its caption (screen readers only by default) and the shared classes', () => {
    const doc = new DOMParser().parseFromString(renderToStaticMarkup(sample()), 'text/html');
    const table = doc.querySelector('table')!;
    expect(table.className).toBe(TABLE_CLASS);
    const caption = table.querySelector('caption')!;
    expect(caption.textContent).toBe('Issued revisions of TPT2');
    expect(caption.className).toBe('sr-only');
    expect(caption.id).not.toBe('');
  });

  it('scopes header cells: columns by default, rows when asked; numeric cells right-aligned with equal-width figures', () => {
    const doc = new DOMParser().parseFromString(renderToStaticMarkup(sample()), 'text/html');
    const [sheet, cells] = [...doc.querySelectorAll('thead th')];
    expect(sheet.getAttribute('scope')).toBe('col');
    expect(sheet.hasAttribute('class')).toBe(false);
    expect(cells.className).toBe('text-right tabular-nums');
    expect(doc.querySelector('tbody th')!.getAttribute('scope')).toBe('row');
    expect(doc.querySelector('tbody td')!.className).toBe('text-right tabular-nums');
  });

  it('puts the table in a box that scrolls sideways, with the box classes given, and no tab stop while nothing scrolls', () => {
    const doc = new DOMParser().parseFromString(
      renderToStaticMarkup(sample({ box: 'mt-3 rounded border', captionClassName: 'text-left' })),
      'text/html',
    );
    const box = doc.body.firstElementChild!;
    expect(box.tagName).toBe('DIV');
    // `relative`: what is positioned inside (KaTeX's hidden MathML) is clipped by the box, not the page.
    expect(box.className).toBe('relative overflow-x-auto mt-3 rounded border');
    expect(box.hasAttribute('tabindex')).toBe(false);
    expect(box.hasAttribute('role')).toBe(false);
    expect(doc.querySelector('caption')!.className).toBe('text-left');
  });

  it('keeps a box that already scrolls both ways as it is, and a fixed name makes it a region always', () => {
    const doc = new DOMParser().parseFromString(
      renderToStaticMarkup(sample({ box: 'max-h-96 overflow-auto', boxLabel: 'Sweep, line 3' })),
      'text/html',
    );
    const box = doc.body.firstElementChild!;
    expect(box.className).toBe('relative max-h-96 overflow-auto');
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('aria-label')).toBe('Sweep, line 3');
  });
});

describe('overflows', () => {
  it('is true only when the content is wider or taller than the box by more than a pixel of rounding', () => {
    expect(overflows({ scrollWidth: 800, clientWidth: 600, scrollHeight: 100, clientHeight: 100 })).toBe(true);
    expect(overflows({ scrollWidth: 600, clientWidth: 600, scrollHeight: 300, clientHeight: 200 })).toBe(true);
    expect(overflows({ scrollWidth: 601, clientWidth: 600, scrollHeight: 100, clientHeight: 100 })).toBe(false);
    expect(overflows({ scrollWidth: 400, clientWidth: 600, scrollHeight: 100, clientHeight: 100 })).toBe(false);
  });
});

describe('in the browser', () => {
  const observers: Array<() => void> = [];
  const restore: Array<() => void> = [];
  beforeAll(() => {
    // jsdom lays nothing out: a ResizeObserver the test fires itself, and sizes set per element.
    const g = globalThis as unknown as { ResizeObserver?: unknown; IS_REACT_ACT_ENVIRONMENT?: boolean };
    const ro = g.ResizeObserver;
    g.ResizeObserver = class {
      constructor(callback: () => void) {
        observers.push(callback);
      }
      observe() {}
      disconnect() {}
    };
    g.IS_REACT_ACT_ENVIRONMENT = true;
    restore.push(() => (g.ResizeObserver = ro));
  });
  afterAll(() => restore.forEach((f) => f()));

  it('makes the box a focusable region named by the caption while the table is wider than it, and undoes it when it fits', async () => {
    const host = document.createElement('div');
    document.body.appendChild(host);
    const root = createRoot(host);
    await act(async () => root.render(sample()));
    const box = host.firstElementChild as HTMLDivElement;
    expect(box.hasAttribute('tabindex')).toBe(false);

    let scrollWidth = 900;
    Object.defineProperty(box, 'scrollWidth', { configurable: true, get: () => scrollWidth });
    Object.defineProperty(box, 'clientWidth', { configurable: true, get: () => 600 });
    await act(async () => observers.forEach((fire) => fire()));
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    const caption = host.querySelector('caption')!;
    expect(box.getAttribute('aria-labelledby')).toBe(caption.id);

    scrollWidth = 600;
    await act(async () => observers.forEach((fire) => fire()));
    expect(box.hasAttribute('tabindex')).toBe(false);
    expect(box.hasAttribute('role')).toBe(false);
    await act(async () => root.unmount());
    host.remove();
  });
});
