import { type DynamicModule, Global, Module } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from './app-config.js';

/** Makes the resolved AppConfig injectable everywhere as APP_CONFIG. */
@Global()
@Module({})
export class AppConfigModule {
  static register(cfg: AppConfig): DynamicModule {
    return {
      module: AppConfigModule,
      providers: [{ provide: APP_CONFIG, useValue: cfg }],
      exports: [APP_CONFIG],
    };
  }
}
