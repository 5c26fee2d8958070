import { parseHTML } from 'linkedom';
import { describe, expect, it } from 'vitest';
import { escapeHtml, html, raw } from '../../src/html/escape.js';

// Oracle: linkedom, a general-purpose HTML parser (npm), reads our escaped markup back; the text and
// attribute values it recovers must equal the original strings exactly.
const hostile = [
  '<script>alert("x")</script>',
  `Tom & Jerry's "best" <b>deal</b>`,
  '&amp; already escaped? &lt;',
  "' onmouseover='alert(1)",
  '" onfocus="alert(2)',
  'plain text',
  '',
  '</textarea></title><img src=x onerror=alert(3)>',
];

function roundTrip(s: string): { text: string; attr: string | null; elements: number } {
  const { document } = parseHTML(`<!doctype html><html><body><p id="t" title="${escapeHtml(s)}" data-x='${escapeHtml(s)}'>${escapeHtml(s)}</p></body></html>`);
  const p = document.getElementById('t')!;
  return { text: p.textContent ?? '', attr: p.getAttribute('data-x'), elements: document.body.querySelectorAll('*').length };
}

describe('escapeHtml', () => {
  it('maps the five special characters (HTML standard entities, written out by hand)', () => {
    expect(escapeHtml(`&<>"'`)).toBe('&amp;&lt;&gt;&quot;&#39;');
    expect(escapeHtml('no specials')).toBe('no specials');
  });

  for (const s of hostile) {
    it(`round-trips through an HTML parser unchanged: ${JSON.stringify(s)}`, () => {
      const r = roundTrip(s);
      expect(r.text).toBe(s);
      expect(r.attr).toBe(s);
      expect(r.elements).toBe(1); // nothing injected: only our <p>
    });
  }
});

describe('html template', () => {
  it('escapes interpolated strings and numbers, keeps raw() markup, flattens arrays, drops null/false', () => {
    const name = '<i>x</i> & "y"';
    const m = html`<p class="c">${name} ${3} ${raw('<b>ok</b>')} ${[html`<em>${'<'}</em>`, 'a&b']} ${null}${false}${undefined}</p>`;
    expect(m.html).toBe('<p class="c">&lt;i&gt;x&lt;/i&gt; &amp; &quot;y&quot; 3 <b>ok</b> <em>&lt;</em>a&amp;b </p>');
  });
});
