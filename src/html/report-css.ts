/** The report's inline style sheet: system fonts only, readable on screen, tidy on paper. */
import { INK, MUTED, PANEL, RULE, SERIES } from './palette.js';

export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { -webkit-text-size-adjust: 100%; }
body { margin: 0; background: #e9ecf1; color: ${INK}; font: 15px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; }
main { max-width: 860px; margin: 24px auto; background: #fff; padding: 36px 44px 28px; border-radius: 6px; box-shadow: 0 1px 3px rgba(20, 30, 50, 0.12); }
header.top { border-bottom: 3px solid ${SERIES.recommended}; padding-bottom: 14px; margin-bottom: 18px; }
.kicker { text-transform: uppercase; letter-spacing: 0.08em; font-size: 12px; color: ${MUTED}; margin: 0 0 4px; }
h1 { font-size: 27px; line-height: 1.2; margin: 0 0 8px; }
h2 { font-size: 20px; margin: 34px 0 6px; padding-top: 4px; border-top: 1px solid ${RULE}; }
h2 .num { color: ${SERIES.recommended}; margin-right: 6px; }
h3 { font-size: 15px; margin: 18px 0 6px; }
p { margin: 6px 0 10px; }
.lede { color: #3b4250; margin: 0 0 10px; max-width: 70ch; }
.facts { display: flex; flex-wrap: wrap; gap: 6px 18px; margin: 8px 0 0; padding: 0; list-style: none; color: ${MUTED}; font-size: 13px; }
.facts b { color: ${INK}; font-weight: 600; }
.verdicts { background: ${PANEL}; border-left: 5px solid ${SERIES.recommended}; padding: 14px 18px 10px 34px; margin: 12px 0 6px; border-radius: 0 4px 4px 0; }
.verdicts li { margin: 0 0 7px; }
.verdicts li:first-child { font-weight: 600; }
.explain { color: #3b4250; font-size: 14px; max-width: 75ch; }
figure { margin: 12px 0 6px; }
figure svg { display: block; max-width: 100%; height: auto; }
figcaption { color: ${MUTED}; font-size: 13px; margin-top: 4px; max-width: 80ch; }
.chart-box { border: 1px solid ${RULE}; border-radius: 4px; padding: 8px 8px 4px; background: #fff; }
table { border-collapse: collapse; width: 100%; font-size: 13.5px; margin: 8px 0 12px; font-variant-numeric: tabular-nums; }
table.changes th.change { width: 28%; }
table.changes th.advice { width: 34%; }
table.sim { font-size: 12.5px; }
table.sim th.group { text-align: center; border-bottom: 1px solid ${RULE}; }
th, td { text-align: left; padding: 6px 8px; border-bottom: 1px solid ${RULE}; vertical-align: top; }
th { font-weight: 600; color: #3b4250; background: ${PANEL}; border-bottom: 2px solid ${RULE}; }
td.n, th.n { text-align: right; white-space: nowrap; }
.name, td.id, .keep { white-space: nowrap; }
tr.flag-bad td { background: #fff4e8; }
tr.flag-good td { background: #eef5fb; }
.tag { display: inline-block; font-size: 11.5px; font-weight: 700; padding: 1px 7px; border-radius: 10px; border: 1.5px solid; white-space: nowrap; }
.tag.bad { color: #8a4a00; border-color: ${SERIES.warning}; background: #fff; }
.tag.bad::before { content: "▲ "; }
.tag.good { color: ${SERIES.recommended}; border-color: ${SERIES.recommended}; background: #fff; }
.tag.good::before { content: "▼ "; }
.tag.stop { color: #fff; background: ${INK}; border-color: ${INK}; }
.muted { color: ${MUTED}; }
.why { display: inline-block; margin-top: 3px; font-size: 12px; color: ${MUTED}; line-height: 1.35; }
.note { font-size: 13px; color: ${MUTED}; border-left: 3px solid ${RULE}; padding-left: 10px; }
footer { margin-top: 30px; padding-top: 10px; border-top: 1px solid ${RULE}; font-size: 12px; color: ${MUTED}; }
@media (max-width: 700px) { main { padding: 18px; margin: 0; border-radius: 0; } }
@media print {
  @page { size: A4; margin: 14mm 12mm; }
  body { background: #fff; font-size: 10.5pt; }
  main { max-width: none; margin: 0; padding: 0; box-shadow: none; }
  h2 { break-after: avoid; page-break-after: avoid; }
  figure, table, .verdicts, tr { break-inside: avoid; page-break-inside: avoid; }
  .chart-box { border: none; padding: 0; }
  figure svg { width: auto; height: auto; max-width: 100%; max-height: 240mm; margin: 0 auto; -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  tr.flag-bad td, tr.flag-good td, th, .verdicts { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
`;
