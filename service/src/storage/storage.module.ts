import { Global, Module } from '@nestjs/common';
import { join } from 'node:path';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { BLOB_STORE } from './blob-store.js';
import { FsBlobStore } from './fs-blob-store.js';

/** Default upload ceiling: 512 MB (issue 6). Larger models should be uploaded gzip-compressed. */
export const DEFAULT_UPLOAD_LIMIT_BYTES = 512 * 1024 * 1024;

export interface StorageSettings {
  root: string;
  uploadLimitBytes: number;
}
export const STORAGE_SETTINGS = Symbol('STORAGE_SETTINGS');

export function storageSettings(cfg: AppConfig, env = process.env): StorageSettings {
  const rawLimit = env.FOLDFOLIO_UPLOAD_LIMIT_BYTES;
  const limit = rawLimit ? Number(rawLimit) : DEFAULT_UPLOAD_LIMIT_BYTES;
  if (!Number.isInteger(limit) || limit <= 0) {
    throw new Error(
      `FOLDFOLIO_UPLOAD_LIMIT_BYTES must be a positive whole number of bytes; it is "${rawLimit}". Fix or unset it.`,
    );
  }
  return {
    root: env.FOLDFOLIO_STORAGE_DIR ?? join(cfg.varDir, 'storage'),
    uploadLimitBytes: limit,
  };
}

@Global()
@Module({
  providers: [
    {
      provide: STORAGE_SETTINGS,
      inject: [APP_CONFIG],
      useFactory: (cfg: AppConfig) => storageSettings(cfg),
    },
    {
      provide: BLOB_STORE,
      inject: [STORAGE_SETTINGS],
      useFactory: (s: StorageSettings) => new FsBlobStore(s.root),
    },
  ],
  exports: [BLOB_STORE, STORAGE_SETTINGS],
})
export class StorageModule {}
