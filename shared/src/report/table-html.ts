/**
 * The HTML tags a methods-table template may produce: the service's sanitiser keeps only these,
 * and the UI builds React elements only for these. One list for both sides.
 */
export const TABLE_HTML_TAGS: readonly string[] = [
  'table',
  'caption',
  'thead',
  'tbody',
  'tfoot',
  'tr',
  'th',
  'td',
  'p',
  'ol',
  'ul',
  'li',
  'sup',
  'sub',
  'em',
  'strong',
  'br',
  'span',
  'div',
];
