import { Column, Entity, PrimaryColumn } from 'typeorm';

export type TemplateKind = 'figure' | 'table';
/** Where a stored template lives: the lab library (every manuscript sees it) or one manuscript. */
export type TemplateScope = 'lab' | 'manuscript';

/** A forked template: a named line of versions for one built-in slot (its `key`). */
@Entity('templates')
export class Template {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ type: 'varchar', length: 8 })
  kind: TemplateKind;

  /** the built-in template this one stands in for (e.g. torsion-plot, methods-xray) */
  @Column({ name: 'template_key', type: 'varchar', length: 60 })
  key: string;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  @Column({ type: 'varchar', length: 12 })
  scope: TemplateScope;

  @Column({ name: 'manuscript_id', type: 'char', length: 36, nullable: true })
  manuscriptId: string | null;

  /** "<templateId>@<n>" of the version it was forked from */
  @Column({ name: 'forked_from', type: 'varchar', length: 80 })
  forkedFrom: string;

  @Column({ name: 'created_by', type: 'char', length: 36, nullable: true })
  createdBy: string | null;

  @Column({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}

/** One immutable saved state of a template (never updated, never deleted on its own). */
@Entity('template_versions')
export class TemplateVersion {
  @PrimaryColumn({ name: 'template_id', type: 'char', length: 36 })
  templateId: string;

  @PrimaryColumn({ type: 'int' })
  n: number;

  @Column({ type: 'mediumtext' })
  body: string;

  @Column({ type: 'char', length: 64 })
  sha256: string;

  @Column({ name: 'author_id', type: 'char', length: 36, nullable: true })
  authorId: string | null;

  @Column({ name: 'author_name', type: 'varchar', length: 120 })
  authorName: string;

  @Column({ type: 'varchar', length: 500 })
  message: string;

  @Column({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}

/** The version a manuscript uses for one slot; no row = the built-in version. */
@Entity('template_pins')
export class TemplatePin {
  @PrimaryColumn({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @PrimaryColumn({ name: 'template_key', type: 'varchar', length: 60 })
  key: string;

  /** "builtin:<key>" or a stored template's id */
  @Column({ name: 'template_id', type: 'varchar', length: 80 })
  templateId: string;

  @Column({ type: 'int' })
  n: number;

  @Column({ name: 'pinned_by', type: 'char', length: 36, nullable: true })
  pinnedBy: string | null;

  @Column({ name: 'pinned_at', type: 'datetime', precision: 3 })
  pinnedAt: Date;
}

/** The methods-table form of one model version: the author's entries over the file's values. */
@Entity('methods_forms')
export class MethodsFormEntry {
  @PrimaryColumn({ name: 'model_version_id', type: 'char', length: 36 })
  modelVersionId: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  /** JSON object: field key → value (null clears a file value) */
  @Column({ name: 'values_json', type: 'mediumtext' })
  valuesJson: string;

  @Column({ name: 'updated_by', type: 'char', length: 36, nullable: true })
  updatedBy: string | null;

  @Column({ name: 'updated_at', type: 'datetime', precision: 3 })
  updatedAt: Date;
}
