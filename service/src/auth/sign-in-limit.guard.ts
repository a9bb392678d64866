import {
  type CanActivate,
  type ExecutionContext,
  HttpException,
  HttpStatus,
  Inject,
  Injectable,
  type OnModuleDestroy,
} from '@nestjs/common';
import type { Request, Response } from 'express';
import { Redis } from 'ioredis';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';

/**
 * Limits sign-in, registration and reset requests per client address and e-mail address with a
 * fixed window counted in Redis, so every service process behind one Redis shares the count.
 * Keying on the address pair means one person mistyping does not lock out a whole lab behind
 * the same address, while a guesser is slowed on each account.
 * (We count in Redis ourselves because @nestjs/throttler 6 is a CommonJS build that cannot load
 * the ESM-only NestJS 12 under jest.)
 */
@Injectable()
export class SignInLimitGuard implements CanActivate, OnModuleDestroy {
  private readonly redis: Redis;

  constructor(@Inject(APP_CONFIG) private readonly cfg: AppConfig) {
    this.redis = new Redis({
      host: cfg.redis.host,
      port: cfg.redis.port,
      lazyConnect: true,
      maxRetriesPerRequest: 2,
    });
  }

  async canActivate(ctx: ExecutionContext): Promise<boolean> {
    const req = ctx.switchToHttp().getRequest<Request>();
    const res = ctx.switchToHttp().getResponse<Response>();
    const body = req.body as { email?: unknown } | undefined;
    const email = typeof body?.email === 'string' ? body.email.trim().toLowerCase() : '';
    // The database name keeps separate installs (and test runs) sharing one Redis apart.
    const key = `foldfolio:${this.cfg.db.database}:limit:${ctx.getHandler().name}:${req.ip}|${email}`;
    const windowMs = this.cfg.signInWindowSec * 1000;
    let count: number;
    let ttlMs: number;
    try {
      const out = await this.redis.multi().incr(key).pexpire(key, windowMs, 'NX').pttl(key).exec();
      count = Number(out?.[0]?.[1] ?? 0);
      ttlMs = Number(out?.[2]?.[1] ?? windowMs);
    } catch {
      throw new HttpException(
        'Sign-in is unavailable for a moment (the rate-limit store does not answer). Try again in a minute.',
        HttpStatus.SERVICE_UNAVAILABLE,
      );
    }
    if (count > this.cfg.signInLimit) {
      const wait = Math.max(1, Math.ceil(ttlMs / 1000));
      res.setHeader('Retry-After', String(wait));
      throw new HttpException(
        `Too many attempts for this address. Wait ${wait} seconds and try again, or reset your password.`,
        HttpStatus.TOO_MANY_REQUESTS,
      );
    }
    return true;
  }

  onModuleDestroy(): void {
    this.redis.disconnect();
  }
}
