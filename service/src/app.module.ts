import { type DynamicModule, Module } from '@nestjs/common';
import { APP_FILTER, APP_GUARD } from '@nestjs/core';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AdminModule } from './admin/admin.module.js';
import { AuthModule } from './auth/auth.module.js';
import { JwtAuthGuard } from './auth/guards.js';
import { type AppConfig } from './config/app-config.js';
import { AppConfigModule } from './config/config.module.js';
import { dataSourceOptions } from './database.js';
import { HealthModule } from './health/health.module.js';
import { InvitationsModule } from './invitations/invitations.module.js';
import { MailModule } from './mail/mail.module.js';
import { ManuscriptRoleGuard } from './manuscripts/manuscript-roles.js';
import { ManuscriptsModule } from './manuscripts/manuscripts.module.js';
import { DemoSeedService } from './seed/demo-seed.service.js';
import { UsersModule } from './users/users.module.js';
import { ModelsModule } from './models/models.module.js';
import { DatabaseUnavailableFilter } from './common/database-unavailable.filter.js';
import { LedgerModule } from './ledger/ledger.module.js';
import { CommentsModule } from './comments/comments.module.js';
import { NotificationsModule } from './notifications/notifications.module.js';
import { PackagesModule } from './packages/packages.module.js';
import { TemplatesModule } from './templates/templates.module.js';
import { FiguresModule } from './figures/figures.module.js';

@Module({})
export class AppModule {
  /** The whole app for one resolved configuration (tests pass their own database and ports). */
  static register(cfg: AppConfig): DynamicModule {
    return {
      module: AppModule,
      imports: [
        AppConfigModule.register(cfg),
        TypeOrmModule.forRoot(dataSourceOptions(cfg)),
        UsersModule,
        MailModule,
        AuthModule,
        ManuscriptsModule,
        InvitationsModule,
        AdminModule,
        HealthModule,
        ModelsModule,
        LedgerModule,
        CommentsModule,
        NotificationsModule,
        PackagesModule,
        TemplatesModule,
        FiguresModule,
      ],
      providers: [
        // Order matters: first who you are (JWT), then what you may do on a manuscript.
        { provide: APP_GUARD, useExisting: JwtAuthGuard },
        { provide: APP_GUARD, useExisting: ManuscriptRoleGuard },
        DemoSeedService,
        // MariaDB down or restarting → 503 with a sentence (issue 6 fault test)
        { provide: APP_FILTER, useClass: DatabaseUnavailableFilter },
      ],
    };
  }
}
