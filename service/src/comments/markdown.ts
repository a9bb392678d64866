import { Marked } from 'marked';
import sanitizeHtml from 'sanitize-html';

// One parser instance with fixed options: the same Markdown always renders the same HTML.
const marked = new Marked({ gfm: true, breaks: true, async: false });

/**
 * Markdown → HTML safe to insert into the page: only formatting tags survive, links keep
 * http(s)/mailto targets and open without access to the opener. Raw HTML in the Markdown is
 * escaped or dropped by the sanitizer, never executed.
 */
export function renderMarkdown(md: string): string {
  const raw = marked.parse(md) as string;
  return sanitizeHtml(raw, {
    allowedTags: [
      'p',
      'br',
      'strong',
      'em',
      'del',
      'code',
      'pre',
      'blockquote',
      'ul',
      'ol',
      'li',
      'a',
      'h3',
      'h4',
      'h5',
      'h6',
      'hr',
      'table',
      'thead',
      'tbody',
      'tr',
      'th',
      'td',
      'sub',
      'sup',
    ],
    allowedAttributes: { a: ['href', 'title', 'rel', 'target'] },
    allowedSchemes: ['http', 'https', 'mailto'],
    transformTags: {
      a: sanitizeHtml.simpleTransform('a', {
        rel: 'noopener noreferrer nofollow',
        target: '_blank',
      }),
      // headings inside a comment stay small
      h1: 'h4',
      h2: 'h4',
    },
  }).trim();
}

/** The @tokens of a comment (letters, digits, dot, dash, underscore), lower-cased, unique. */
export function mentionTokens(md: string): string[] {
  const out = new Set<string>();
  // a mention starts the text or follows a non-word character, so e-mail addresses do not count
  for (const m of md.matchAll(/(^|[^\w@])@([\p{L}\p{N}._-]{1,64})/gu)) {
    out.add(m[2].replace(/[._-]+$/, '').toLowerCase());
  }
  return [...out].filter((t) => t !== '');
}
