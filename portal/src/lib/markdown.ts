import DOMPurify from 'dompurify';
import { Marked } from 'marked';

/** Our own parser instance, so nothing else in the page can change how proposals render. */
const parser = new Marked({ gfm: true, breaks: false, async: false });

/**
 * Our own sanitizer instance: links are given target and rel on the cleaned DOM, inside
 * DOMPurify, never by editing its output as text (an attribute value holding "<a href=" would
 * otherwise be turned into markup by such an edit).
 */
const purifier = typeof window === 'undefined' ? null : DOMPurify(window);
purifier?.addHook('afterSanitizeAttributes', (node) => {
  if (node.tagName === 'A' && node.hasAttribute('href')) {
    node.setAttribute('target', '_blank');
    node.setAttribute('rel', 'noopener noreferrer');
  }
});

// Tags a proposal has no use for: forms could post elsewhere, images would load from other
// origins (the CSP refuses them), styles could dress text up as Localis's own controls.
const FORBID_TAGS = ['style', 'form', 'input', 'button', 'textarea', 'select', 'option', 'img', 'iframe', 'object', 'embed', 'svg', 'math'];

/**
 * A proposal's Markdown as HTML safe to put in the page: parsed by marked, then cleaned by
 * DOMPurify (no scripts, event handlers, `javascript:` links or inline styles). Links open in a
 * new tab without handing it this page.
 */
export function renderMarkdown(text: string | null | undefined): string {
  if (!text?.trim()) return '';
  // Without a working sanitizer, show the text as text rather than trust it as HTML.
  if (!purifier?.isSupported) return `<pre>${escapeHtml(text)}</pre>`;
  const html = parser.parse(text) as string;
  return purifier.sanitize(html, { FORBID_TAGS, FORBID_ATTR: ['style'], ADD_ATTR: ['target'], RETURN_TRUSTED_TYPE: false }) as string;
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);
}
