import { type MigrationInterface, type QueryRunner } from 'typeorm';

/** Accounts, sessions, manuscripts, memberships, invitations and the mail sink. */
export class Foundation1764680000000 implements MigrationInterface {
  name = 'Foundation1764680000000';

  public async up(q: QueryRunner): Promise<void> {
    const opts = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE users (
      id CHAR(36) NOT NULL PRIMARY KEY,
      email VARCHAR(254) NOT NULL,
      display_name VARCHAR(100) NOT NULL,
      password_hash VARCHAR(100) NOT NULL,
      site_role VARCHAR(16) NOT NULL DEFAULT 'user',
      token_version INT NOT NULL DEFAULT 0,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_users_email (email)
    ) ${opts}`);
    await q.query(`CREATE TABLE refresh_tokens (
      id CHAR(36) NOT NULL PRIMARY KEY,
      user_id CHAR(36) NOT NULL,
      family_id CHAR(36) NOT NULL,
      token_hash CHAR(64) NOT NULL,
      expires_at DATETIME(3) NOT NULL,
      revoked_at DATETIME(3) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_refresh_family (family_id),
      CONSTRAINT fk_refresh_user FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
    ) ${opts}`);
    await q.query(`CREATE TABLE password_resets (
      id CHAR(36) NOT NULL PRIMARY KEY,
      user_id CHAR(36) NOT NULL,
      token_hash CHAR(64) NOT NULL,
      expires_at DATETIME(3) NOT NULL,
      used_at DATETIME(3) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_password_resets_token (token_hash),
      CONSTRAINT fk_reset_user FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
    ) ${opts}`);
    await q.query(`CREATE TABLE manuscripts (
      id CHAR(36) NOT NULL PRIMARY KEY,
      title VARCHAR(300) NOT NULL,
      status VARCHAR(16) NOT NULL DEFAULT 'active',
      created_by CHAR(36) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      last_activity_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      CONSTRAINT fk_manuscript_creator FOREIGN KEY (created_by) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE memberships (
      id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NOT NULL,
      user_id CHAR(36) NOT NULL,
      role VARCHAR(16) NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_membership (manuscript_id, user_id),
      KEY ix_membership_user (user_id),
      CONSTRAINT fk_membership_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_membership_user FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
    ) ${opts}`);
    await q.query(`CREATE TABLE invitations (
      id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NOT NULL,
      email VARCHAR(254) NOT NULL,
      role VARCHAR(16) NOT NULL,
      token_hash CHAR(64) NOT NULL,
      invited_by CHAR(36) NULL,
      expires_at DATETIME(3) NOT NULL,
      accepted_at DATETIME(3) NULL,
      accepted_by CHAR(36) NULL,
      revoked_at DATETIME(3) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_invitation_token (token_hash),
      KEY ix_invitation_manuscript (manuscript_id),
      CONSTRAINT fk_invitation_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_invitation_inviter FOREIGN KEY (invited_by) REFERENCES users (id) ON DELETE SET NULL,
      CONSTRAINT fk_invitation_acceptor FOREIGN KEY (accepted_by) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE mail_messages (
      id CHAR(36) NOT NULL PRIMARY KEY,
      from_addr VARCHAR(320) NOT NULL,
      to_addrs TEXT NOT NULL,
      subject VARCHAR(500) NOT NULL,
      text_body MEDIUMTEXT NOT NULL,
      html_body MEDIUMTEXT NULL,
      received_at DATETIME(3) NOT NULL,
      KEY ix_mail_received (received_at)
    ) ${opts}`);
  }

  public async down(q: QueryRunner): Promise<void> {
    for (const t of [
      'mail_messages',
      'invitations',
      'memberships',
      'manuscripts',
      'password_resets',
      'refresh_tokens',
      'users',
    ]) {
      await q.query(`DROP TABLE ${t}`);
    }
  }
}
