/**
 * Escaping of user text for HTML and SVG. Every string that comes from a scenario (names, class
 * ids, labels, units) goes through one of these before it is put into markup.
 */

const TEXT: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escapes text for element content and for quoted attribute values (both quote kinds). */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => TEXT[c]!);
}

/** A tagged template that escapes every interpolated value unless it is already `Markup`. */
export class Markup {
  constructor(readonly html: string) {}
  toString(): string {
    return this.html;
  }
}

/** Trusted markup (built by this module's callers from escaped pieces). */
export function raw(html: string): Markup {
  return new Markup(html);
}

type Piece = string | number | Markup | null | undefined | false | readonly Piece[];

function piece(v: Piece): string {
  if (v === null || v === undefined || v === false) return '';
  if (v instanceof Markup) return v.html;
  if (Array.isArray(v)) return (v as readonly Piece[]).map(piece).join('');
  if (typeof v === 'number') return escapeHtml(String(v));
  return escapeHtml(v as string);
}

/** html`<p>${userText}</p>`: interpolated strings and numbers are escaped, Markup is kept. */
export function html(strings: TemplateStringsArray, ...values: Piece[]): Markup {
  let out = strings[0]!;
  for (let i = 0; i < values.length; i++) out += piece(values[i]!) + strings[i + 1]!;
  return new Markup(out);
}
