import { Column, Entity, PrimaryColumn } from 'typeorm';
import type { AnalysisStage, AnalysisStatus } from '@foldfolio/shared';

/** The engine's run on one model version: state, progress, summary columns and the report. */
@Entity('analyses')
export class Analysis {
  @PrimaryColumn({ name: 'model_version_id', type: 'char', length: 36 })
  modelVersionId: string;

  @Column({ type: 'varchar', length: 16 })
  status: AnalysisStatus;

  @Column({ type: 'varchar', length: 16, nullable: true })
  stage: AnalysisStage | null;

  @Column({ type: 'int' })
  progress: number;

  @Column({ type: 'int' })
  attempts: number;

  /** How many times a run finished and stored a report (1 for every healthy analysis). */
  @Column({ type: 'int' })
  completions: number;

  @Column({ type: 'text', nullable: true })
  error: string | null;

  @Column({ type: 'varchar', length: 120, nullable: true })
  worker: string | null;

  @Column({ name: 'engine_version', type: 'varchar', length: 40, nullable: true })
  engineVersion: string | null;

  @Column({ name: 'reference_id', type: 'varchar', length: 80, nullable: true })
  referenceId: string | null;

  @Column({ name: 'queued_at', type: 'datetime', precision: 3 })
  queuedAt: Date;

  @Column({ name: 'started_at', type: 'datetime', precision: 3, nullable: true })
  startedAt: Date | null;

  @Column({ name: 'finished_at', type: 'datetime', precision: 3, nullable: true })
  finishedAt: Date | null;

  @Column({ type: 'int', nullable: true }) atoms: number | null;
  @Column({ name: 'protein_residues', type: 'int', nullable: true }) proteinResidues: number | null;
  @Column({ name: 'rama_favored', type: 'int', nullable: true }) ramaFavored: number | null;
  @Column({ name: 'rama_allowed', type: 'int', nullable: true }) ramaAllowed: number | null;
  @Column({ name: 'rama_outliers', type: 'int', nullable: true }) ramaOutliers: number | null;
  @Column({ name: 'rama_total', type: 'int', nullable: true }) ramaTotal: number | null;
  @Column({ name: 'rotamer_outliers', type: 'int', nullable: true }) rotamerOutliers: number | null;
  @Column({ name: 'rotamer_total', type: 'int', nullable: true }) rotamerTotal: number | null;
  @Column({ name: 'bond_rmsd', type: 'double', nullable: true }) bondRmsd: number | null;
  @Column({ name: 'bond_rmsz', type: 'double', nullable: true }) bondRmsz: number | null;
  @Column({ name: 'angle_rmsd', type: 'double', nullable: true }) angleRmsd: number | null;
  @Column({ name: 'angle_rmsz', type: 'double', nullable: true }) angleRmsz: number | null;
  @Column({ name: 'overlaps_per_1000', type: 'double', nullable: true }) overlapsPer1000:
    number | null;
  @Column({ name: 'cis_peptides', type: 'int', nullable: true }) cisPeptides: number | null;
  @Column({ name: 'twisted_peptides', type: 'int', nullable: true }) twistedPeptides: number | null;
  @Column({ name: 'cb_outliers', type: 'int', nullable: true }) cbOutliers: number | null;
  @Column({ name: 'd_residues', type: 'int', nullable: true }) dResidues: number | null;

  @Column({ name: 'report_sha256', type: 'char', length: 64, nullable: true })
  reportSha256: string | null;

  /** gzip of the report JSON (foldfolio.report/1) */
  @Column({ name: 'report_gz', type: 'longblob', nullable: true, select: false })
  reportGz: Buffer | null;
}
