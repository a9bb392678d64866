// Shows a methods table rendered by the service as React elements built from an allow-list of
// table tags (the service sanitises too; the UI never injects HTML).
import { createElement, type ReactNode } from 'react';
import { TABLE_HTML_TAGS } from '@foldfolio/shared/api';

const TAGS: ReadonlySet<string> = new Set(TABLE_HTML_TAGS);

function convert(node: Node, key: number): ReactNode {
  if (node.nodeType === Node.TEXT_NODE) return node.textContent;
  if (node.nodeType !== Node.ELEMENT_NODE) return null;
  const el = node as Element;
  const tag = el.tagName.toLowerCase();
  const children = Array.from(el.childNodes).map((c, i) => convert(c, i));
  if (!TAGS.has(tag)) return <span key={key}>{children}</span>;
  const props: Record<string, unknown> = { key };
  const cls = el.getAttribute('class');
  if (cls) props.className = cls;
  for (const a of ['colspan', 'rowspan'] as const) {
    const v = Number(el.getAttribute(a));
    if (v > 0) props[a === 'colspan' ? 'colSpan' : 'rowSpan'] = v;
  }
  const scope = el.getAttribute('scope');
  if (scope) props.scope = scope;
  if (tag === 'br') return createElement('br', props);
  // whitespace text between table rows is not allowed as a child of table sections
  const kept = ['table', 'thead', 'tbody', 'tfoot', 'tr'].includes(tag)
    ? children.filter((c) => typeof c !== 'string' || c.trim() !== '')
    : children;
  return createElement(tag, props, ...kept);
}

export function SafeTable({ html }: { html: string }) {
  const doc = new DOMParser().parseFromString(`<body>${html}</body>`, 'text/html');
  return (
    <div className="ff-methods-table" data-testid="methods-table-preview">
      {Array.from(doc.body.childNodes).map((n, i) => convert(n, i))}
    </div>
  );
}

/** An SVG figure shown as an image (no script runs inside an <img>). */
export function SvgImage({ svg, alt }: { svg: string; alt: string }) {
  return (
    <img
      className="ff-figure-img"
      alt={alt}
      src={`data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`}
    />
  );
}
