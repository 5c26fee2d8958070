/**
 * Renders an Observable Plot chart to markup in Node, offline: Plot builds its SVG in a small DOM
 * (linkedom) that we create per chart, and we keep the serialised result. Text that Plot writes
 * into the DOM (tick labels, titles) is escaped by the serialiser.
 *
 * Our own layers go inside the same SVG: a header band above the plot (the legend), a footer band
 * below it (a long axis label), and an overlay drawn in the plot's own pixel coordinates from its
 * scales (markers and direct labels placed so that they never collide). The viewBox covers all.
 */
import * as Plot from '@observablehq/plot';
import { parseHTML } from 'linkedom';
import { escapeHtml, raw, type Markup } from './escape.js';

/** The plot's scales in pixels and its frame (the area inside the margins). */
export interface PlotFrame {
  x(value: number): number;
  y(value: number): number;
  readonly width: number;
  readonly height: number;
  readonly left: number;
  readonly right: number;
  readonly top: number;
  readonly bottom: number;
}

export interface PlotExtras {
  /** Band above the plot: its height and its markup, drawn from y = 0. */
  readonly header?: { readonly height: number; readonly markup: Markup };
  /** Band below the plot: its height and its markup, drawn from y = 0 of the band. */
  readonly footer?: { readonly height: number; readonly markup: Markup };
  /** Markup drawn over the plot, in the plot's own coordinates. */
  readonly overlay?: (frame: PlotFrame) => Markup;
}

interface PlotNode {
  outerHTML: string;
  innerHTML: string;
  tagName: string;
  attributes: ArrayLike<{ name: string; value: string }>;
  querySelector(sel: string): PlotNode | null;
  scale(name: string): { apply(v: unknown): number } | undefined;
}

/** Serialised chart: one <svg> holding the plot and our layers. */
export function renderPlot(options: Plot.PlotOptions, extras: PlotExtras = {}): Markup {
  const { document } = parseHTML('<!doctype html><html><head></head><body></body></html>');
  const node = Plot.plot({ ...options, document: document as unknown as Plot.PlotOptions['document'] }) as unknown as PlotNode;
  const svg = node.tagName.toLowerCase() === 'svg' ? node : node.querySelector('svg')!;
  const width = Number(options.width ?? 640);
  const height = Number(options.height ?? 400);
  const xs = node.scale('x');
  const ys = node.scale('y');
  const frame: PlotFrame = {
    x: (v) => (xs ? xs.apply(v) : NaN),
    y: (v) => (ys ? ys.apply(v) : NaN),
    width,
    height,
    left: Number(options.marginLeft ?? 0),
    right: width - Number(options.marginRight ?? 0),
    top: Number(options.marginTop ?? 0),
    bottom: height - Number(options.marginBottom ?? 0),
  };
  const overlay = extras.overlay ? extras.overlay(frame).html : '';
  const head = extras.header?.height ?? 0;
  const foot = extras.footer?.height ?? 0;
  const total = head + height + foot;
  const attrs: string[] = [];
  for (const a of Array.from(svg.attributes)) {
    if (a.name === 'width' || a.name === 'height' || a.name === 'viewBox') continue;
    attrs.push(`${a.name}="${escapeHtml(a.value)}"`);
  }
  attrs.push(`width="${width}"`, `height="${total}"`, `viewBox="0 0 ${width} ${total}"`);
  const header = extras.header ? `<g class="chart-header">${extras.header.markup.html}</g>` : '';
  const footer = extras.footer ? `<g class="chart-footer" transform="translate(0,${head + height})">${extras.footer.markup.html}</g>` : '';
  return raw(`<svg ${attrs.join(' ')}>${header}<g transform="translate(0,${head})">${svg.innerHTML}<g class="chart-overlay">${overlay}</g></g>${footer}</svg>`);
}

export { Plot };
