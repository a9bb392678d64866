import { Controller, Get, Inject, type OnModuleDestroy } from '@nestjs/common';
import { ApiTags } from '@nestjs/swagger';
import { InjectDataSource } from '@nestjs/typeorm';
import { Redis } from 'ioredis';
import { DataSource } from 'typeorm';
import type { HealthDto } from '@foldfolio/shared';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { Public } from '../common/request-user.js';

@ApiTags('health')
@Controller('health')
export class HealthController implements OnModuleDestroy {
  private readonly redis: Redis;

  constructor(
    @InjectDataSource() private readonly db: DataSource,
    @Inject(APP_CONFIG) cfg: AppConfig,
  ) {
    this.redis = new Redis({
      host: cfg.redis.host,
      port: cfg.redis.port,
      lazyConnect: true,
      maxRetriesPerRequest: 1,
      enableOfflineQueue: false,
      connectTimeout: 1000,
    });
    this.redis.on('error', () => undefined);
  }

  @Public()
  @Get()
  async health(): Promise<HealthDto> {
    const database = await this.db
      .query('SELECT 1')
      .then(() => true)
      .catch(() => false);
    const redis = await (this.redis.status === 'ready' ? Promise.resolve() : this.redis.connect())
      .then(() => this.redis.ping())
      .then((r) => r === 'PONG')
      .catch(() => false);
    return { status: database && redis ? 'ok' : 'degraded', database, redis };
  }

  onModuleDestroy(): void {
    this.redis.disconnect();
  }
}
