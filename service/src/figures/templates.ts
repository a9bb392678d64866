/** Built-in figure templates and presets from the repository's templates/ folder. */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FigureManifest, Preset } from './types.js';

/** templates/ at the repository root (src/figures and dist/figures are both three levels down). */
export function templatesRoot(): string {
  const env = process.env.FOLDFOLIO_ROOT;
  const root = env ? resolve(env) : resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
  const dir = join(root, 'templates');
  if (!existsSync(dir))
    throw new Error(
      `The templates folder ${dir} is missing; set FOLDFOLIO_ROOT to the Foldfolio checkout.`,
    );
  return dir;
}

export function listPresets(): Preset[] {
  const dir = join(templatesRoot(), 'presets');
  return readdirSync(dir)
    .filter((f) => f.endsWith('.json'))
    .sort()
    .map((f) => JSON.parse(readFileSync(join(dir, f), 'utf8')) as Preset);
}

export function loadPreset(id: string): Preset {
  const p = listPresets().find((x) => x.id === id);
  if (!p)
    throw new Error(
      `There is no preset "${id}"; choose one of ${listPresets()
        .map((x) => x.id)
        .join(', ')}.`,
    );
  return p;
}

export interface FigureTemplate {
  manifest: FigureManifest;
  /** the Vega-Lite spec text with {"$param": name} placeholders */
  specText: string;
}

export function listFigureTemplates(): FigureTemplate[] {
  const dir = join(templatesRoot(), 'figures');
  return readdirSync(dir)
    .sort()
    .filter((d) => existsSync(join(dir, d, 'manifest.json')))
    .map((d) => ({
      manifest: JSON.parse(readFileSync(join(dir, d, 'manifest.json'), 'utf8')) as FigureManifest,
      specText: readFileSync(join(dir, d, 'spec.vl.json'), 'utf8'),
    }));
}

export function loadFigureTemplate(id: string): FigureTemplate {
  const t = listFigureTemplates().find((x) => x.manifest.id === id);
  if (!t)
    throw new Error(
      `There is no figure template "${id}"; choose one of ${listFigureTemplates()
        .map((x) => x.manifest.id)
        .join(', ')}.`,
    );
  return t;
}
