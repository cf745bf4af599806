'use client';

import { useEffect, useRef, useState, type ReactNode } from 'react';
import { formatNumberText } from '@/lib/calc/format';
import type { PlotData } from '@/lib/calc/types';
import { axisLabel, unitLabel } from '@/lib/calc/unit-label';
import { plotAxisLabels, plotDescription, plotElement } from '@/lib/plots/plot-figure';
import { Table, Td, Th } from '@/components/ui/table';

const MAX_WIDTH = 760;

/**
 * A statement's plot, drawn in the browser by the same code as the issued PDF's figure
 * (lib/plots/plot-figure.ts), with a text alternative: the caption says what is plotted, and
 * "Show data" lists every point, so the numbers are there for screen readers and keyboards.
 */
export function PlotView({
  plot,
  significantFigures = 6,
  label,
}: {
  plot: PlotData;
  significantFigures?: number;
  label?: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);
  const description = plotDescription(plot);

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const measure = () => setWidth(Math.min(MAX_WIDTH, Math.floor(el.clientWidth)));
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(el);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    const el = box.current;
    if (!el || width < 120) return;
    const svg = plotElement(plot, window.document, { width, fontFamily: 'inherit' });
    svg.setAttribute('role', 'img');
    svg.setAttribute('aria-label', `${description} The points are listed under "Show data".`);
    el.replaceChildren(svg);
  }, [plot, width, description]);

  // The figure as a standalone SVG file (fixed width, the fonts named), for a report or a slide.
  const downloadSvg = () => {
    const svg = plotElement(plot, window.document, { width: MAX_WIDTH });
    svg.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
    const url = URL.createObjectURL(new Blob([svg.outerHTML], { type: 'image/svg+xml' }));
    const a = window.document.createElement('a');
    a.href = url;
    a.download = `${
      (label ?? 'figure')
        .replace(/[^A-Za-z0-9]+/g, '-')
        .replace(/^-|-$/g, '')
        .toLowerCase() || 'figure'
    }.svg`;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };

  const axes = plotAxisLabels(plot);
  const horizonUnit = unitLabel(plot.x.unit ?? plot.y.unit);
  return (
    <figure className="my-2 min-w-0">
      <div ref={box} className="w-full text-ink" style={{ minHeight: 160 }} />
      <figcaption className="mt-1 text-xs text-ink-muted">
        {label ? <span className="font-semibold text-ink">{label}: </span> : null}
        {description}
      </figcaption>
      <button
        type="button"
        onClick={downloadSvg}
        className="mt-1 text-sm text-accent underline underline-offset-2 hover:no-underline"
      >
        Download as SVG<span className="sr-only"> ({label ?? 'figure'})</span>
      </button>
      <details className="mt-1 text-sm">
        <summary className="cursor-pointer text-accent underline-offset-2 hover:underline">Show data</summary>
        <div className="mt-1 space-y-3">
          {plot.series.map((s, i) => (
            <PointsTable
              key={i}
              caption={`${s.name} (${s.points.length} point${s.points.length === 1 ? '' : 's'})`}
              boxLabel={`Points of ${s.name}`}
              x={axes.x}
              y={axes.y}
              points={s.points}
              significantFigures={significantFigures}
            />
          ))}
          {(plot.data ?? []).map((d, i) => (
            <PointsTable
              key={`data-${i}`}
              caption={`${d.name}, table data (${d.points.length} point${d.points.length === 1 ? '' : 's'})`}
              boxLabel={`Points of ${d.name} (table data)`}
              x={axisLabel(d.x, plot.x.unit)}
              y={axisLabel(d.y, plot.y.unit)}
              points={d.points}
              significantFigures={significantFigures}
            />
          ))}
          {plot.limits?.length ? (
            <ul className="list-disc pl-5 text-xs">
              {plot.limits.map((l, i) => (
                <li key={i}>
                  design limit {l.name} = {formatNumberText(l.value, significantFigures)}
                  {plot.y.unit ? ` ${unitLabel(plot.y.unit)}` : ''}
                </li>
              ))}
            </ul>
          ) : null}
          {plot.kind === 'spacetime' && plot.horizons?.length ? (
            <ul className="list-disc pl-5 text-xs">
              {plot.horizons.map((h, i) => (
                <li key={i}>
                  {h.name}: x = ct − {formatNumberText(h.distance, significantFigures)}
                  {horizonUnit ? ` ${horizonUnit}` : ''}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      </details>
    </figure>
  );
}

/** The points of one curve or of a table's data, as the plot's "Show data" lists them. */
function PointsTable({
  caption,
  boxLabel,
  x,
  y,
  points,
  significantFigures,
}: {
  caption: string;
  boxLabel: string;
  x: ReactNode;
  y: ReactNode;
  points: ReadonlyArray<readonly [number, number]>;
  significantFigures: number;
}) {
  return (
    <Table
      caption={caption}
      captionClassName="bg-paper px-2 py-1 text-left font-semibold"
      className="w-full border-collapse text-xs"
      box="max-h-80 overflow-auto rounded border border-rule"
      boxLabel={boxLabel}
    >
      <thead>
        <tr>
          <Th className="border-b border-rule px-2 py-1 text-right font-semibold">{x}</Th>
          <Th className="border-b border-rule px-2 py-1 text-right font-semibold">{y}</Th>
        </tr>
      </thead>
      <tbody className="font-mono">
        {points.map(([px, py], k) => (
          <tr key={k} className="border-t border-rule first:border-t-0">
            <Td numeric className="px-2 py-0.5">
              {formatNumberText(px, significantFigures)}
            </Td>
            <Td numeric className="px-2 py-0.5">
              {formatNumberText(py, significantFigures)}
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
