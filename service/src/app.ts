import { ConsoleLogger, Logger } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { type NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import cookieParser from 'cookie-parser';
import type { NextFunction, Request, Response } from 'express';
import helmet from 'helmet';
import { join } from 'node:path';
import { AppModule } from './app.module.js';
import { type AppConfig } from './config/app-config.js';
import { createValidationPipe } from './common/validation.js';
import { SmtpSinkService } from './mail/smtp-sink.service.js';

/** Nest's own start-up chatter (one line per module and route) only with FOLDFOLIO_VERBOSE=1. */
const CHATTY = new Set(['InstanceLoader', 'RoutesResolver', 'RouterExplorer', 'NestFactory']);
class StartupQuietLogger extends ConsoleLogger {
  override log(message: unknown, context?: string): void {
    if (context && CHATTY.has(context) && process.env.FOLDFOLIO_VERBOSE !== '1') return;
    super.log(message, context);
  }
}

/**
 * Builds the configured application: security headers, cookies, validation, OpenAPI at
 * /api/docs, the built UI, and the local mail sink. main.ts and the e2e tests both use it.
 */
export async function createApp(cfg: AppConfig): Promise<NestExpressApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.register(cfg), {
    logger: new StartupQuietLogger({
      logLevels: process.env.FOLDFOLIO_QUIET === '1' ? ['error'] : ['log', 'warn', 'error'],
    }),
  });
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        // Over plain http on 127.0.0.1 an upgrade to https would break every asset request.
        directives: { upgradeInsecureRequests: cfg.secureCookies ? [] : null },
      },
    }),
  );
  app.use(cookieParser());
  app.setGlobalPrefix('api');
  app.useGlobalPipes(createValidationPipe());
  app.enableShutdownHooks();

  const doc = new DocumentBuilder()
    .setTitle('Foldfolio API')
    .setDescription('REST API of Foldfolio. Every manuscript route checks the caller’s role.')
    .setVersion('0.1.0')
    .addBearerAuth()
    .addCookieAuth('ff_refresh')
    .build();
  SwaggerModule.setup('api/docs', app, SwaggerModule.createDocument(app, doc), {
    jsonDocumentUrl: 'api/docs-json',
  });

  if (cfg.uiDist) {
    const uiDist = cfg.uiDist;
    app.useStaticAssets(uiDist, { index: false, maxAge: '1h' });
    // Single-page app: every non-API GET that is not a file gets index.html.
    app.use((req: Request, res: Response, next: NextFunction) => {
      if (req.method !== 'GET' || req.path.startsWith('/api')) return next();
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(join(uiDist, 'index.html'));
    });
  } else {
    new Logger('App').warn('ui/dist not built: serving the API only (run `npm run build`).');
  }

  try {
    await app.get(SmtpSinkService).start();
  } catch (err) {
    await app.close(); // release the database and Redis connections opened so far
    throw err;
  }
  return app;
}
