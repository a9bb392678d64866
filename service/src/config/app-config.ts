import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Everything the service reads from its environment, resolved once at start. */
export interface AppConfig {
  root: string;
  varDir: string;
  db: { host: string; port: number; user: string; password: string; database: string };
  redis: { host: string; port: number };
  /** HTTP port on 127.0.0.1 (0 = any free port, used by tests). */
  port: number;
  /** Base of the links put into e-mails, e.g. http://127.0.0.1:8080 */
  publicUrl: string;
  /** Port of the local SMTP sink (0 = any free port, used by tests). */
  smtpPort: number;
  jwtSecret: string;
  accessTokenTtlSec: number;
  refreshTokenTtlDays: number;
  /** A rotated refresh token presented again within this many seconds is a tab race, not theft. */
  refreshReuseGraceSec: number;
  invitationTtlDays: number;
  passwordResetTtlMin: number;
  bcryptCost: number;
  /** Sign-in attempts allowed per e-mail address and client within `signInWindowSec`. */
  signInLimit: number;
  signInWindowSec: number;
  secureCookies: boolean;
  /** Built UI to serve, or null when it has not been built. */
  uiDist: string | null;
  seedDemo: boolean;
}

type Env = Record<string, string | undefined>;

function int(env: Env, name: string, fallback: number): number {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0) {
    throw new Error(
      `${name} must be a non-negative whole number; it is "${raw}". Fix or unset it.`,
    );
  }
  return n;
}

/**
 * The per-install signing secret: generated on first start into var/app-secret (mode 600) and
 * never committed (var/ is git-ignored). FOLDFOLIO_JWT_SECRET overrides it (tests use that).
 */
export function installSecret(varDir: string, env: Env = process.env): string {
  const fromEnv = env.FOLDFOLIO_JWT_SECRET;
  if (fromEnv) return fromEnv;
  const file = join(varDir, 'app-secret');
  if (!existsSync(file)) {
    mkdirSync(varDir, { recursive: true });
    writeFileSync(file, randomBytes(48).toString('base64url'), { mode: 0o600, flag: 'wx' });
  }
  return readFileSync(file, 'utf8').trim();
}

export function loadConfig(env: Env = process.env): AppConfig {
  // service/src/config and service/dist/config are both three levels below the repository root.
  const root = env.FOLDFOLIO_ROOT ?? fileURLToPath(new URL('../../..', import.meta.url));
  const varDir = env.FOLDFOLIO_VAR ?? join(root, 'var');
  const passwordFile = join(varDir, 'db-password');
  const dbPassword =
    env.FOLDFOLIO_DB_PASSWORD ??
    (existsSync(passwordFile) ? readFileSync(passwordFile, 'utf8').trim() : '');
  const port = int(env, 'FOLDFOLIO_PORT', 8080);
  const uiDist = env.FOLDFOLIO_UI_DIST ?? join(root, 'ui', 'dist');
  return {
    root,
    varDir,
    db: {
      host: env.FOLDFOLIO_DB_HOST ?? '127.0.0.1',
      port: int(env, 'FOLDFOLIO_DB_PORT', 33061),
      user: env.FOLDFOLIO_DB_USER ?? 'foldfolio',
      password: dbPassword,
      database: env.FOLDFOLIO_DB_NAME ?? 'foldfolio',
    },
    redis: {
      host: env.FOLDFOLIO_REDIS_HOST ?? '127.0.0.1',
      port: int(env, 'FOLDFOLIO_REDIS_PORT', 63791),
    },
    port,
    publicUrl: (env.FOLDFOLIO_PUBLIC_URL ?? `http://127.0.0.1:${port}`).replace(/\/+$/, ''),
    smtpPort: int(env, 'FOLDFOLIO_SMTP_PORT', 2526),
    jwtSecret: installSecret(varDir, env),
    // 15 min access / 14 day refresh: common practice for SPA sessions, no source.
    accessTokenTtlSec: int(env, 'FOLDFOLIO_ACCESS_TTL_SEC', 15 * 60),
    refreshTokenTtlDays: int(env, 'FOLDFOLIO_REFRESH_TTL_DAYS', 14),
    refreshReuseGraceSec: int(env, 'FOLDFOLIO_REFRESH_GRACE_SEC', 10),
    invitationTtlDays: 7,
    passwordResetTtlMin: 60,
    // bcrypt cost 12 ≈ 0.2–0.4 s per hash in pure JS here; OWASP asks for at least 10.
    bcryptCost: Math.max(10, int(env, 'FOLDFOLIO_BCRYPT_COST', 12)),
    signInLimit: int(env, 'FOLDFOLIO_SIGNIN_LIMIT', 5),
    signInWindowSec: int(env, 'FOLDFOLIO_SIGNIN_WINDOW_SEC', 60),
    secureCookies: env.FOLDFOLIO_SECURE_COOKIES === '1',
    uiDist: existsSync(join(uiDist, 'index.html')) ? uiDist : null,
    seedDemo: env.FOLDFOLIO_SEED_DEMO === '1',
  };
}

export const APP_CONFIG = Symbol('APP_CONFIG');
