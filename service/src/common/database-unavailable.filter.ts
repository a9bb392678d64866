import { type ArgumentsHost, Catch, ServiceUnavailableException } from '@nestjs/common';
import { BaseExceptionFilter } from '@nestjs/core';

// mysql2 / TypeORM error codes that mean "the database is not reachable right now" rather than a
// fault of the request (mysql2 error codes and MariaDB server error names; common practice)
const UNAVAILABLE = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'PROTOCOL_CONNECTION_LOST',
  'PROTOCOL_SEQUENCE_TIMEOUT',
  'ER_SERVER_SHUTDOWN',
  'ER_CON_COUNT_ERROR',
  'ER_LOCK_WAIT_TIMEOUT',
]);

export function isDatabaseOutage(err: unknown): boolean {
  for (let e: unknown = err, depth = 0; e && depth < 4; depth++) {
    const o = e as {
      code?: unknown;
      errno?: unknown;
      driverError?: unknown;
      cause?: unknown;
      message?: unknown;
    };
    if (typeof o.code === 'string' && UNAVAILABLE.has(o.code)) return true;
    if (
      typeof o.message === 'string' &&
      /Pool is closed|Connection lost|connect ECONNREFUSED/i.test(o.message)
    ) {
      return true;
    }
    e = o.driverError ?? o.cause;
  }
  return false;
}

/**
 * A request that fails because MariaDB is down or restarting gets 503 with a sentence instead of
 * a bare 500; the connection pool reconnects by itself once the database is back, so the service
 * recovers without a restart. Every other error keeps Nest's normal handling.
 */
@Catch()
export class DatabaseUnavailableFilter extends BaseExceptionFilter {
  override catch(exception: unknown, host: ArgumentsHost): void {
    if (host.getType() === 'http' && isDatabaseOutage(exception)) {
      super.catch(
        new ServiceUnavailableException(
          'Foldfolio cannot reach its database right now. Wait a moment and try again; if it lasts, ask an admin to check MariaDB.',
        ),
        host,
      );
      return;
    }
    super.catch(exception, host);
  }
}
