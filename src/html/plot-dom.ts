/**
 * Renders an Observable Plot chart to markup in Node, offline: Plot builds its SVG in a small DOM
 * (linkedom) that we create per chart, and we keep the serialised result. Text that Plot writes
 * into the DOM (tick labels, titles) is escaped by the serialiser.
 */
import * as Plot from '@observablehq/plot';
import { parseHTML } from 'linkedom';
import { raw, type Markup } from './escape.js';

/** Serialised chart (an <svg>, or a <figure> holding legends and the <svg>). */
export function renderPlot(options: Plot.PlotOptions): Markup {
  const { document } = parseHTML('<!doctype html><html><head></head><body></body></html>');
  const node = Plot.plot({ ...options, document: document as unknown as Plot.PlotOptions['document'] }) as unknown as { outerHTML: string };
  return raw(node.outerHTML);
}

export { Plot };
