/**
 * Checks a template body before it is saved or previewed, reporting the line of the first
 * problem: figure specs must be JSON objects; table templates must compile in the sandbox.
 */
import { renderSandboxed, TemplateError } from '../tables/sandbox.js';
import type { TemplateKind } from './template.entities.js';

export class TemplateBodyError extends Error {
  constructor(
    message: string,
    readonly line: number | null,
  ) {
    super(message);
  }
}

/** 1-based line of a character offset. */
export function lineAt(text: string, offset: number): number {
  return text.slice(0, Math.max(0, offset)).split('\n').length;
}

/** JSON.parse with the line of a syntax error (Node reports "position N"). */
export function parseSpec(body: string): Record<string, unknown> {
  let parsed: unknown;
  try {
    parsed = JSON.parse(body);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    const lineCol = /line (\d+)/.exec(msg);
    const line = pos ? lineAt(body, Number(pos[1])) : lineCol ? Number(lineCol[1]) : null;
    throw new TemplateBodyError(
      `The figure spec is not valid JSON${line ? ` (line ${line})` : ''}: ${msg}. Fix the line and try again.`,
      line,
    );
  }
  if (!parsed || typeof parsed !== 'object' || Array.isArray(parsed))
    throw new TemplateBodyError(
      'A figure spec must be one JSON object (a Vega-Lite specification); start it with "{".',
      1,
    );
  return parsed as Record<string, unknown>;
}

/** The helpers table templates may call (tables/render.ts registers the real ones). */
const TABLE_HELPERS = ['val', 'range', 'list', 'ratio', 'sources'];

export function checkTemplateBody(kind: TemplateKind, body: string): void {
  if (kind === 'figure') {
    parseSpec(body);
    return;
  }
  const helpers = Object.fromEntries(
    TABLE_HELPERS.map((h) => [h, () => (h === 'sources' ? [] : '')]),
  );
  try {
    renderSandboxed(body, {}, helpers);
  } catch (e) {
    if (!(e instanceof TemplateError)) throw e;
    // rendering with empty values fails on names only the real context has: not a compile error
    if (/does not compile|is not allowed/.test(e.message))
      throw new TemplateBodyError(e.message, e.line);
  }
}
