import { existsSync, mkdirSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { graphSvg } from '../../src/html/graph-svg.js';
import { paretoChart } from '../../src/html/pareto-chart.js';
import { REPORT_CSS } from '../../src/html/report-css.js';
import { sweepChart } from '../../src/html/sweep-chart.js';
import { waitChart } from '../../src/html/wait-chart.js';
import { graphsOf, narrowGraph, paretoOf, sweepOf, waitsOf } from '../helpers/drawing-fixtures.js';

// Renders every drawing of the report at 16 and 40 classes (seeded, invented designs) in headless
// Chromium (Debian's package at /usr/bin/chromium, driven by playwright-core; no browser is ever
// downloaded) and measures what the browser really draws: the box of every <text> from
// getBoundingClientRect(), and of every shape. Checks: no two texts overlap, no text covers a
// class's disc in the graph, every element lies inside its SVG's viewBox, no text is smaller than
// 10 px. One screenshot per drawing goes to .test-output/drawings/.
//
// Without /usr/bin/chromium the test is skipped with a message, except in CI (CI=true).

const CHROMIUM = '/usr/bin/chromium';
const root = join(import.meta.dirname, '..', '..');
const outDir = join(root, '.test-output', 'drawings');
const available = existsSync(CHROMIUM);
const run = available || process.env['CI'] === 'true';
if (!run) console.warn(`\n[tests/browser/drawings] SKIPPED: ${CHROMIUM} not found (install Debian's chromium: apt-get install -y chromium).\n`);

const shapes = ['ring', 'zones', 'groups'];
const drawings: Array<{ id: string; markup: string; graph: boolean }> = [];
for (const n of [16, 40]) {
  graphsOf(n, 100 + n).forEach((pic, k) => drawings.push({ id: `graph-${shapes[k]}-${n}`, markup: graphSvg(pic).html, graph: true }));
  drawings.push({ id: `sweep-${n}`, markup: sweepChart(sweepOf(n)).html, graph: false });
  drawings.push({ id: `pareto-${n}`, markup: paretoChart(paretoOf(n)).html, graph: false });
  drawings.push({ id: `waits-${n}`, markup: waitChart(waitsOf(n, n)).html, graph: false });
}
// a narrow drawing where some names do not fit: numbers beside the discs and a key under them
drawings.push({ id: 'graph-narrow-key', markup: graphSvg(narrowGraph(3)).html, graph: true });

// A control drawing with two overprinting texts, a text on a disc and a shape outside the viewBox:
// the measurement must find all three, so that a clean result elsewhere means something.
const CONTROL =
  '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 200 60" width="200" height="60"><g class="node"><circle cx="150" cy="30" r="12"/></g><text x="10" y="30">overprinted one</text><text x="14" y="34">overprinted two</text><text x="140" y="34">on disc</text><circle cx="230" cy="20" r="6"/></svg>';

interface Measured {
  id: string;
  texts: number;
  overlaps: string[];
  outside: string[];
  overDiscs: string[];
  small: string[];
}

describe.skipIf(!run)('drawings in headless Chromium at 16 and 40 classes', () => {
  let context: BrowserContext;
  let page: Page;
  let profile: string;
  let measured: Measured[] = [];

  beforeAll(async () => {
    mkdirSync(outDir, { recursive: true });
    profile = mkdtempSync(join(tmpdir(), 'edgewise-chromium-'));
    context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      viewport: { width: 900, height: 900 },
    });
    page = await context.newPage();
    await page.route('**/*', (route) => route.abort());
    const body = [...drawings, { id: 'control', markup: CONTROL }].map((d) => `<figure class="chart-box" id="${d.id}">${d.markup}</figure>`).join('\n');
    await page.setContent(`<!doctype html><html><head><meta charset="utf-8"><style>${REPORT_CSS}</style></head><body><main>${body}</main></body></html>`, { waitUntil: 'load' });
    measured = await page.evaluate((ids: Array<{ id: string; graph: boolean }>) => {
      const doc = (globalThis as any).document;
      return ids.map(({ id, graph }) => {
        const svg = doc.querySelector(`#${id} > svg`);
        const box = svg.getBoundingClientRect();
        const vb = svg.viewBox.baseVal;
        const sx = box.width / vb.width;
        const sy = box.height / vb.height;
        const name = (el: any): string => `${el.tagName}${el.getAttribute('class') ? `.${el.getAttribute('class')}` : ''} “${(el.textContent ?? '').trim().slice(0, 40)}”`;
        const outside: string[] = [];
        for (const el of Array.from(svg.querySelectorAll('text, tspan, circle, path, line, rect, polyline, polygon')) as any[]) {
          if (el.closest('defs, clipPath, mask, title')) continue;
          const r = el.getBoundingClientRect();
          if (r.width === 0 && r.height === 0) continue;
          const tol = 0.75;
          if (r.left < box.left - tol || r.top < box.top - tol || r.right > box.right + tol || r.bottom > box.bottom + tol) {
            outside.push(`${name(el)} [${Math.round((r.left - box.left) / sx)}, ${Math.round((r.top - box.top) / sy)}, ${Math.round((r.right - box.left) / sx)}, ${Math.round((r.bottom - box.top) / sy)}] of ${vb.width}×${vb.height}`);
          }
        }
        const texts = (Array.from(svg.querySelectorAll('text')) as any[]).filter((t) => (t.textContent ?? '').trim() !== '');
        const rects = texts.map((t) => t.getBoundingClientRect());
        const overlaps: string[] = [];
        for (let i = 0; i < texts.length; i++) {
          for (let j = i + 1; j < texts.length; j++) {
            const a = rects[i];
            const b = rects[j];
            const w = Math.min(a.right, b.right) - Math.max(a.left, b.left);
            const h = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
            if (w > 0.5 && h > 0.5) overlaps.push(`${name(texts[i])} × ${name(texts[j])}`);
          }
        }
        const overDiscs: string[] = [];
        if (graph) {
          const discs = (Array.from(svg.querySelectorAll('g.node')) as any[]).map((g) => {
            const c = g.querySelectorAll('circle');
            const r = c[c.length - 1].getBoundingClientRect();
            return { x: (r.left + r.right) / 2, y: (r.top + r.bottom) / 2, r: r.width / 2 };
          });
          texts.forEach((t, i) => {
            if ((t.getAttribute('class') ?? '').includes('inside')) return;
            const b = rects[i];
            discs.forEach((d, k) => {
              const nx = Math.max(b.left, Math.min(d.x, b.right));
              const ny = Math.max(b.top, Math.min(d.y, b.bottom));
              if (Math.hypot(d.x - nx, d.y - ny) < d.r - 0.5) overDiscs.push(`${name(t)} over disc ${k}`);
            });
          });
        }
        const small = texts.filter((t) => parseFloat((globalThis as any).getComputedStyle(t).fontSize) < 10).map(name);
        return { id, texts: texts.length, overlaps, outside, overDiscs, small };
      });
    }, [...drawings.map((d) => ({ id: d.id, graph: d.graph })), { id: 'control', graph: true }]);
  }, 120_000);

  afterAll(async () => {
    await context?.close();
    if (profile) rmSync(profile, { recursive: true, force: true });
  });

  it('the measurement finds overprinting, a text on a disc and a shape outside the viewBox in a control drawing', () => {
    const c = measured.find((m) => m.id === 'control')!;
    expect(c.overlaps.length).toBe(1);
    expect(c.overDiscs.length).toBe(1);
    expect(c.outside.length).toBe(1);
  });

  it('measures every drawing (16 and 40 classes: graph in three designs, load sweep, cost chart, waits; a narrow graph with a key)', () => {
    expect(measured.map((m) => m.id)).toEqual([...drawings.map((d) => d.id), 'control']);
    for (const m of measured) if (m.id !== 'control') expect(m.texts, m.id).toBeGreaterThan(5);
  });

  for (const d of drawings) {
    it(`${d.id}: no two texts overlap, none covers a disc, everything inside the viewBox, no text under 10 px`, () => {
      const m = measured.find((x) => x.id === d.id)!;
      expect(m.overlaps, 'overlapping texts').toEqual([]);
      expect(m.overDiscs, 'texts over discs').toEqual([]);
      expect(m.outside, 'outside the viewBox').toEqual([]);
      expect(m.small, 'texts under 10 px').toEqual([]);
    });
  }

  it('in print, every drawing keeps its proportions and fits one A4 page (at most 240 mm tall)', async () => {
    await page.emulateMedia({ media: 'print' });
    const sizes = await page.$$eval('figure > svg', (svgs: any[]) =>
      svgs.map((s) => {
        const r = s.getBoundingClientRect();
        const vb = s.viewBox.baseVal;
        return { id: s.parentElement.id, w: r.width, h: r.height, ratio: vb.width / vb.height };
      }),
    );
    await page.emulateMedia({ media: 'screen' });
    const mm = 96 / 25.4;
    for (const s of sizes) {
      expect(s.w * s.h, s.id).toBeGreaterThan(0);
      expect(s.h, s.id).toBeLessThanOrEqual(240 * mm + 1);
      expect(s.w / s.h, s.id).toBeCloseTo(s.ratio, 1);
    }
  });

  it('saves one screenshot per drawing under .test-output/drawings/', async () => {
    for (const d of drawings) {
      const shot = join(outDir, `${d.id}.png`);
      await page.locator(`#${d.id}`).screenshot({ path: shot });
      expect(statSync(shot).size, d.id).toBeGreaterThan(5_000);
    }
  });
});
