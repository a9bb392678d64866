import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Stored (forked) templates, their immutable versions, per-manuscript pins, methods forms. */
export class Templates1764710000000 implements MigrationInterface {
  name = 'Templates1764710000000';

  public async up(q: QueryRunner): Promise<void> {
    const opts = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE templates (
      id CHAR(36) NOT NULL PRIMARY KEY,
      kind VARCHAR(8) NOT NULL,
      template_key VARCHAR(60) NOT NULL,
      name VARCHAR(120) NOT NULL,
      scope VARCHAR(12) NOT NULL,
      manuscript_id CHAR(36) NULL,
      forked_from VARCHAR(80) NOT NULL,
      created_by CHAR(36) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_template_scope (scope, manuscript_id),
      CONSTRAINT fk_template_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_template_user FOREIGN KEY (created_by) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE template_versions (
      template_id CHAR(36) NOT NULL,
      n INT NOT NULL,
      body MEDIUMTEXT NOT NULL,
      sha256 CHAR(64) NOT NULL,
      author_id CHAR(36) NULL,
      author_name VARCHAR(120) NOT NULL,
      message VARCHAR(500) NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (template_id, n),
      CONSTRAINT fk_template_version_template FOREIGN KEY (template_id) REFERENCES templates (id) ON DELETE CASCADE,
      CONSTRAINT fk_template_version_user FOREIGN KEY (author_id) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE template_pins (
      manuscript_id CHAR(36) NOT NULL,
      template_key VARCHAR(60) NOT NULL,
      template_id VARCHAR(80) NOT NULL,
      n INT NOT NULL,
      pinned_by CHAR(36) NULL,
      pinned_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (manuscript_id, template_key),
      CONSTRAINT fk_template_pin_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE
    ) ${opts}`);
    await q.query(`CREATE TABLE methods_forms (
      model_version_id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NOT NULL,
      values_json MEDIUMTEXT NOT NULL,
      updated_by CHAR(36) NULL,
      updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      CONSTRAINT fk_methods_form_version FOREIGN KEY (model_version_id) REFERENCES model_versions (id) ON DELETE CASCADE
    ) ${opts}`);
    // versions are immutable: the database refuses edits and single deletions
    await q.query(`CREATE TRIGGER template_versions_immutable BEFORE UPDATE ON template_versions
      FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'Template versions are immutable; save a new version instead.'`);
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query('DROP TRIGGER IF EXISTS template_versions_immutable');
    await q.query('DROP TABLE IF EXISTS methods_forms');
    await q.query('DROP TABLE IF EXISTS template_pins');
    await q.query('DROP TABLE IF EXISTS template_versions');
    await q.query('DROP TABLE IF EXISTS templates');
  }
}
