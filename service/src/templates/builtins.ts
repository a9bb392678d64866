/** The built-in templates from templates/ seen as version lines with one version each. */
import { createHash } from 'node:crypto';
import { listFigureTemplates } from '../figures/templates.js';
import type { FigureManifest } from '../figures/types.js';
import { listTableTemplates, type TableManifest } from '../tables/render.js';
import type { TemplateKind } from './template.entities.js';

export const BUILTIN_PREFIX = 'builtin:';

export interface BuiltinTemplate {
  id: string;
  kind: TemplateKind;
  key: string;
  name: string;
  n: number;
  body: string;
  sha256: string;
  figure?: FigureManifest;
  table?: TableManifest;
}

export function sha256Text(s: string): string {
  return createHash('sha256').update(s, 'utf8').digest('hex');
}

let cache: BuiltinTemplate[] | null = null;

/** Read once per process: the templates folder ships with the build and does not change. */
export function builtinTemplates(): BuiltinTemplate[] {
  if (cache) return cache;
  const figures = listFigureTemplates().map<BuiltinTemplate>((t) => ({
    id: BUILTIN_PREFIX + t.manifest.id,
    kind: 'figure',
    key: t.manifest.id,
    name: t.manifest.title,
    n: t.manifest.version,
    body: t.specText,
    sha256: sha256Text(t.specText),
    figure: t.manifest,
  }));
  const tables = listTableTemplates().map<BuiltinTemplate>((t) => ({
    id: BUILTIN_PREFIX + t.manifest.id,
    kind: 'table',
    key: t.manifest.id,
    name: t.manifest.title,
    n: t.manifest.version,
    body: t.source,
    sha256: sha256Text(t.source),
    table: t.manifest,
  }));
  cache = [...figures, ...tables];
  return cache;
}

export function builtinByKey(key: string): BuiltinTemplate | undefined {
  return builtinTemplates().find((b) => b.key === key);
}
