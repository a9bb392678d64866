import type { RamaClass, Report } from '@foldfolio/shared';

export interface Preset {
  id: string;
  name: string;
  widthMm: number;
  maxHeightMm: number;
  fontSizePt: { title: number; axisTitle: number; label: number; annotation: number };
  lineWidthPt: { axis: number; grid: number; data: number; outline: number };
  panelColumns: number;
  minFontPt: number;
  minLineWidthPt: number;
  palette: Record<string, string>;
  tones: Record<string, string>;
  fonts: { text: string; symbols: string };
  version: number;
}

export interface TemplateParameter {
  name: string;
  type: 'number' | 'string' | 'boolean';
  default: number | string | boolean;
  description: string;
  min?: number;
  max?: number;
}

export interface FigureManifest {
  id: string;
  kind: 'figure';
  version: number;
  title: string;
  description: string;
  /** which dataset builder feeds the spec */
  data: 'torsion' | 'strip' | 'chi' | 'omega' | 'geometry-z' | 'b-groups' | 'compare';
  /** needs a second (earlier) report */
  needsComparison?: boolean;
  /**
   * Names of the layers that can widen the figure (text, axes); the layout probe draws only
   * these. Omit to probe with every layer.
   */
  probeLayers?: string[];
  parameters: TemplateParameter[];
}

/** A grid over (-180, 180]² with one code per cell; cell (i, j) covers phi from -180 + i·step. */
export interface RegionGrid {
  stepDeg: number;
  size: number;
  /** index i * size + j (i: phi, j: psi); 2 favored, 1 allowed, 0 outside */
  codes: Uint8Array;
}

/** Reference regions for the torsion figure, per residue class (both optional). */
export interface FigureReference {
  id: string;
  empirical?: Partial<Record<RamaClass, RegionGrid>>;
  /** outer-limit hard-sphere maps: 1 allowed at the outer limit (or better), 0 disallowed */
  steric?: Partial<Record<RamaClass, RegionGrid>>;
}

export interface FigureInput {
  report: Report;
  /** the earlier version, for the comparison figure */
  previous?: Report | null;
  reference?: FigureReference | null;
  /** model index within the report (NMR: 0 = first model) */
  modelIndex?: number;
}

export type Dataset = Record<string, unknown>[];
