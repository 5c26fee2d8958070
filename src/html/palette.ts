/**
 * The report's colours, chosen for this project and checked in tests/report/palette.test.ts:
 * every series colour keeps at least 3:1 contrast on white (WCAG 2.1 non-text contrast), and every
 * pair stays far apart (CIELAB ΔE ≥ 20) for normal vision and simulated protanopia, deuteranopia and
 * tritanopia. Colour is never the only cue: each series also has its own dash pattern or shape.
 */

/** Text and axes. */
export const INK = '#1f2430';
/** Secondary text, light rules. */
export const MUTED = '#5b6270';
export const RULE = '#d5d9e0';
/** Candidate lines (quiet but visible). */
export const CANDIDATE = '#a9b0bb';
export const PAPER = '#ffffff';
/** Soft background of panels. */
export const PANEL = '#f4f6f9';

/** Series colours, in the order they are used. */
export const SERIES = {
  /** Today's design (neutral). */
  today: '#7a808a',
  /** The main recommendation. */
  recommended: '#1c4e80',
  /** A second recommendation or an alternative. */
  alternative: '#4a94c9',
  /** Harm, warnings. */
  warning: '#c46a00',
} as const;

export type SeriesRole = keyof typeof SERIES;

/**
 * Text written in a series' colour (direct labels, edge words): the series colour where it reaches
 * 4.5:1 on white (WCAG 2.1 text contrast), else a darker shade of the same hue.
 */
export const SERIES_TEXT: Record<SeriesRole, string> = {
  today: '#4f555e',
  recommended: SERIES.recommended,
  alternative: '#1f5f8f',
  warning: '#8a4a00',
};

/** Stroke dash patterns paired with the series (SVG stroke-dasharray; '' = solid). */
export const DASH: Record<SeriesRole, string> = {
  today: '',
  recommended: '9 3',
  alternative: '2 3',
  warning: '1.5 3.5',
};

/** Symbols paired with the series for scatter marks (Observable Plot symbol names). */
export const SYMBOL: Record<SeriesRole, string> = {
  today: 'square',
  recommended: 'circle',
  alternative: 'diamond',
  warning: 'triangle',
};
