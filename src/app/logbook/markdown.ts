import DOMPurify from 'dompurify';
import { marked } from 'marked';

/**
 * Markdown of a logbook entry as safe HTML: `marked` renders it, raw HTML in the source is
 * shown as text, and DOMPurify keeps only plain formatting tags (no images or media, so a note
 * can never load anything from elsewhere; links open in a new tab without the page's context).
 */
const ALLOWED_TAGS = ['p', 'br', 'strong', 'em', 'del', 'code', 'pre', 'blockquote', 'ul', 'ol', 'li', 'a', 'h1', 'h2', 'h3', 'h4', 'hr', 'table', 'thead', 'tbody', 'tr', 'th', 'td'];

const escapeHtml = (text: string) => text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

marked.use({
  gfm: true,
  breaks: true,
  renderer: {
    // Raw HTML written into a note is shown as the text it is, never parsed.
    html: ({ text }) => escapeHtml(text),
  },
});

export function renderMarkdown(source: string): string {
  const html = marked.parse(source, { async: false });
  const clean = DOMPurify.sanitize(html, { ALLOWED_TAGS, ALLOWED_ATTR: ['href', 'title'], ALLOWED_URI_REGEXP: /^(?:https?:|mailto:|#)/i });
  return clean.replace(/<a /g, '<a target="_blank" rel="noopener noreferrer" ');
}
