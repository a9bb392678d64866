/**
 * Handlebars run sandboxed for user-editable table templates: an isolated environment with a
 * fixed helper list (no `lookup`, no `log`, no partials), prototype access off, every `{{…}}`
 * HTML-escaped (raw `{{{…}}}` / `{{&…}}` refused), and the output passed through an allow-list
 * HTML sanitiser. Compile and render errors name the template line.
 */
import Handlebars from 'handlebars';
import sanitizeHtml from 'sanitize-html';
import { TABLE_HTML_TAGS } from '@foldfolio/shared';

export class TemplateError extends Error {
  constructor(
    message: string,
    readonly line: number | null,
  ) {
    super(message);
  }
}

export type HelperFn = (...args: unknown[]) => unknown;

const BUILTIN_BLOCKS = ['if', 'unless', 'each', 'with'];

/** Tags and attributes a table template may produce. */
export const ALLOWED_HTML: sanitizeHtml.IOptions = {
  allowedTags: [...TABLE_HTML_TAGS],
  allowedAttributes: { '*': ['class', 'colspan', 'rowspan', 'scope'] },
  allowedSchemes: [],
  disallowedTagsMode: 'discard',
};

function lineOf(e: unknown): number | null {
  const err = e as { lineNumber?: number; message?: string };
  if (typeof err.lineNumber === 'number') return err.lineNumber;
  const m = /line (\d+)/i.exec(err.message ?? '');
  return m ? Number(m[1]) : null;
}

export function renderSandboxed(
  source: string,
  context: Record<string, unknown>,
  helpers: Record<string, HelperFn>,
): string {
  const raw = /\{\{\{|\{\{&|\{\{>|\{\{#\*inline|\{\{\s*lookup\b|\{\{\s*log\b/.exec(source);
  if (raw) {
    const line = source.slice(0, raw.index).split('\n').length;
    throw new TemplateError(
      `Line ${line}: "${raw[0]}" is not allowed in a table template (no raw output, partials, lookup or log); use {{…}} and the listed helpers.`,
      line,
    );
  }
  const hb = Handlebars.create();
  hb.unregisterHelper('lookup');
  hb.unregisterHelper('log');
  for (const [name, fn] of Object.entries(helpers))
    hb.registerHelper(name, fn as Handlebars.HelperDelegate);
  const knownHelpers: Record<string, boolean> = {};
  for (const n of [...BUILTIN_BLOCKS, ...Object.keys(helpers)]) knownHelpers[n] = true;
  let template: Handlebars.TemplateDelegate;
  try {
    template = hb.compile(source, {
      strict: true,
      knownHelpers,
      knownHelpersOnly: true,
      noEscape: false,
      preventIndent: true,
    });
    // compile is lazy: force it so syntax errors surface here with their line
    hb.precompile(source, { knownHelpers, knownHelpersOnly: true, strict: true });
  } catch (e) {
    const line = lineOf(e);
    throw new TemplateError(
      `The template does not compile${line ? ` (line ${line})` : ''}: ${(e as Error).message.split('\n')[0]}. Fix the line and save again.`,
      line,
    );
  }
  let html: string;
  try {
    html = template(context, {
      allowProtoPropertiesByDefault: false,
      allowProtoMethodsByDefault: false,
      allowCallsToHelperMissing: false,
    });
  } catch (e) {
    const line = lineOf(e);
    throw new TemplateError(
      `The template failed while rendering${line ? ` (line ${line})` : ''}: ${(e as Error).message.split('\n')[0]}. Check the names it uses.`,
      line,
    );
  }
  return sanitizeHtml(html, ALLOWED_HTML);
}
