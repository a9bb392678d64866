import type { DataSourceOptions } from 'typeorm';
import type { AppConfig } from './config/app-config.js';
import { PasswordReset } from './auth/password-reset.entity.js';
import { RefreshToken } from './auth/refresh-token.entity.js';
import { Invitation } from './invitations/invitation.entity.js';
import { MailMessage } from './mail/mail-message.entity.js';
import { Manuscript } from './manuscripts/manuscript.entity.js';
import { Membership } from './manuscripts/membership.entity.js';
import { Foundation1764680000000 } from './migrations/1764680000000-Foundation.js';
import { User } from './users/user.entity.js';
import { ModelVersion } from './models/model-version.entity.js';
import { Analysis } from './analyses/analysis.entity.js';
import { Comment } from './comments/comment.entity.js';
import { NotificationMute } from './notifications/notification-mute.entity.js';
import { Workflow1764690000000 } from './migrations/1764690000000-Workflow.js';
import { Packages1764700000000 } from './migrations/1764700000000-Packages.js';
import { Templates1764710000000 } from './migrations/1764710000000-Templates.js';
import {
  MethodsFormEntry,
  Template,
  TemplatePin,
  TemplateVersion,
} from './templates/template.entities.js';
import { PackageAuditEvent, ReviewLink, ReviewPackage } from './packages/package.entities.js';

/** Every entity and migration, listed explicitly so the build and ts-jest see the same set. */
export const ENTITIES = [
  User,
  RefreshToken,
  PasswordReset,
  Manuscript,
  Membership,
  Invitation,
  MailMessage,
  ModelVersion,
  Analysis,
  Comment,
  NotificationMute,
  ReviewPackage,
  ReviewLink,
  PackageAuditEvent,
  Template,
  TemplateVersion,
  TemplatePin,
  MethodsFormEntry,
];
export const MIGRATIONS = [
  Foundation1764680000000,
  Workflow1764690000000,
  Packages1764700000000,
  Templates1764710000000,
];

/** MariaDB over mysql2; the schema comes only from migrations (synchronize stays off). */
export function dataSourceOptions(cfg: AppConfig): DataSourceOptions {
  return {
    type: 'mariadb',
    host: cfg.db.host,
    port: cfg.db.port,
    username: cfg.db.user,
    password: cfg.db.password,
    database: cfg.db.database,
    charset: 'utf8mb4_unicode_ci',
    timezone: 'Z',
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsRun: true,
    migrationsTransactionMode: 'each',
    synchronize: false,
    logging: ['error'],
  };
}
