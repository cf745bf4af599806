// The plot figure as SVG text on the server: Observable Plot on a jsdom document, with an explicit
// width and height and the text face shipped in fonts/, so the file looks the same anywhere.
import { JSDOM } from 'jsdom';
import type { PlotData } from '@/lib/calc/types';
import { plotElement, type PlotFigureOptions } from './plot-figure';

let window: JSDOM['window'] | null = null;

/** One jsdom document per process, made on first use (figures are detached elements of it). */
function plotDocument(): Document {
  window ??= new JSDOM('<!DOCTYPE html><html><body></body></html>').window;
  return window.document;
}

/** `plotElement` on the server's document. */
export function serverPlotElement(data: PlotData, options: PlotFigureOptions = {}): SVGSVGElement {
  return plotElement(data, plotDocument(), options);
}

/** The figure as a standalone SVG document string. */
export function plotSvg(data: PlotData, options: PlotFigureOptions = {}): string {
  const svg = serverPlotElement(data, options);
  svg.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  // Explicit size in pixels (Plot sets both; said again so no stylesheet's "height: auto" is needed).
  svg.setAttribute('width', svg.getAttribute('width') ?? String(options.width ?? 640));
  svg.setAttribute('height', svg.getAttribute('height') ?? String(options.height ?? 400));
  return svg.outerHTML;
}
