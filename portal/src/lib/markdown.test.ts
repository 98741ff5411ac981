// @vitest-environment jsdom
// DOMPurify needs a faithful HTML parser; happy-dom keeps <script> and drops <p>, so this file runs in jsdom.
import { describe, expect, it } from 'vitest';
import { renderMarkdown } from './markdown';

describe('markdown', () => {
  describe('renderMarkdown', () => {
    it('should render headings, emphasis, lists and tables when given Markdown', () => {
      const html = renderMarkdown('## Aim\n\nLocate *W_c* for **d = 3**.\n\n- L = 8\n- L = 16\n\n| L | W |\n|---|---|\n| 8 | 16.5 |');
      expect(html).toContain('<h2');
      expect(html).toContain('<em>W_c</em>');
      expect(html).toContain('<strong>d = 3</strong>');
      expect(html).toContain('<li>L = 8</li>');
      expect(html).toContain('<table>');
    });

    it('should drop scripts, event handlers and javascript links when the text carries them', () => {
      const html = renderMarkdown('<script>alert(1)</script>\n\n<p onclick="steal()">x</p>\n\n[click](javascript:alert(1)) <img src="https://elsewhere.example/t.png" onerror="x()">');
      expect(html).not.toContain('<script');
      expect(html).not.toContain('onclick');
      expect(html).not.toContain('javascript:');
      expect(html).not.toContain('<img');
      expect(html).not.toContain('onerror');
    });

    it('should open links in a new tab without an opener when a link is given', () => {
      expect(renderMarkdown('See [the notes](https://example.org/notes).')).toBe('<p>See <a href="https://example.org/notes" target="_blank" rel="noopener noreferrer">the notes</a>.</p>\n');
    });

    it('should keep an attribute value that looks like a link as text when the author hides markup in it', () => {
      // Links get their target on the cleaned DOM, so "<a href=" inside a value never becomes markup.
      const html = renderMarkdown('<span title="<a href=x onmouseover=alert(1) y">hover</span>');
      const doc = new DOMParser().parseFromString(html, 'text/html');
      const span = doc.querySelector('span');
      expect(span?.getAttribute('onmouseover')).toBeNull();
      expect(doc.querySelectorAll('[onmouseover]')).toHaveLength(0);
      expect(doc.querySelectorAll('a')).toHaveLength(0);
    });

    it('should give empty text when there is nothing to render', () => {
      expect(renderMarkdown('   ')).toBe('');
      expect(renderMarkdown(null)).toBe('');
    });
  });
});
