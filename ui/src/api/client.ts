// The one place the UI talks HTTP. The access token lives only in memory (never localStorage),
// the refresh token in the service's httpOnly cookie; a 401 triggers one silent refresh and a
// retry, so short-lived access tokens never surface to the user.
import type { SessionDto } from '@foldfolio/shared';

/** An error the service (or the network) reported, carrying the sentence to show the user. */
export class ApiError extends Error {
  readonly status: number;
  readonly fields?: Record<string, string[]>;
  constructor(status: number, message: string, fields?: Record<string, string[]>) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.fields = fields;
  }
}

type SessionListener = (session: SessionDto | null) => void;

let accessToken: string | null = null;
let refreshing: Promise<SessionDto | null> | null = null;
const listeners = new Set<SessionListener>();

// Whether the last session ended because the user signed out (rather than expired): the route
// guard then sends them to a plain sign-in page instead of one that leads back where they were.
let endedOnPurpose = false;

export function endedByUser(): boolean {
  return endedOnPurpose;
}

export function setSession(session: SessionDto | null, byUser = false): void {
  endedOnPurpose = session === null && byUser;
  accessToken = session?.accessToken ?? null;
  for (const l of listeners) l(session);
}

export function onSessionChange(listener: SessionListener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

export function hasAccessToken(): boolean {
  return accessToken !== null;
}

/** The bearer header for requests made outside `api()` (uploads through XMLHttpRequest). */
export function authorizationHeader(): string | null {
  return accessToken ? `Bearer ${accessToken}` : null;
}

/** Nest answers `message` as a sentence, or as a list of sentences for validation failures. */
async function errorFrom(res: Response): Promise<ApiError> {
  let message = `The server answered ${res.status} ${res.statusText}. Try again in a moment.`;
  let fields: Record<string, string[]> | undefined;
  try {
    const body = (await res.json()) as { message?: unknown; fields?: Record<string, string[]> };
    if (typeof body.message === 'string' && body.message) message = body.message;
    else if (Array.isArray(body.message) && body.message.length)
      message = body.message.map(String).join(' ');
    fields = body.fields;
  } catch {
    // not JSON (a proxy page, say): keep the generic sentence
  }
  return new ApiError(res.status, message, fields);
}

async function send(path: string, init: RequestInit, withToken: boolean): Promise<Response> {
  const headers = new Headers(init.headers);
  if (init.body !== undefined && !headers.has('Content-Type'))
    headers.set('Content-Type', 'application/json');
  headers.set('Accept', 'application/json');
  if (withToken && accessToken) headers.set('Authorization', `Bearer ${accessToken}`);
  try {
    return await fetch(path, { ...init, headers, credentials: 'include' });
  } catch {
    throw new ApiError(
      0,
      'Foldfolio could not reach its server. Check your connection and that the service is running, then try again.',
    );
  }
}

// The service refuses the loser of two simultaneous refreshes (two tabs of one browser) within a
// short grace period; by then the winner's new cookie is in the jar, so one later try succeeds.
const REFRESH_RETRY_DELAY_MS = 400;

async function tryRefresh(): Promise<SessionDto | null> {
  const res = await send('/api/auth/refresh', { method: 'POST' }, false);
  return res.ok ? ((await res.json()) as SessionDto) : null;
}

/**
 * Trades the refresh cookie for a new session. Concurrent callers share one request, because the
 * service rotates the refresh token and a second parallel refresh would present a spent one.
 */
export function refreshSession(): Promise<SessionDto | null> {
  if (!refreshing) {
    refreshing = (async () => {
      try {
        let session = await tryRefresh();
        if (!session && accessToken !== null) {
          // only a live session can have lost a race; a first visit without a cookie has not
          await new Promise((r) => setTimeout(r, REFRESH_RETRY_DELAY_MS));
          session = await tryRefresh();
        }
        setSession(session);
        return session;
      } catch {
        setSession(null);
        return null;
      } finally {
        refreshing = null;
      }
    })();
  }
  return refreshing;
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  /** Public routes (sign-in, invitation preview) skip the token and the refresh-on-401. */
  anonymous?: boolean;
}

export async function api<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  const init: RequestInit = {
    method: opts.method ?? 'GET',
    body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
  };
  let res = await send(path, init, !opts.anonymous);
  if (res.status === 401 && !opts.anonymous) {
    const session = await refreshSession();
    if (session) res = await send(path, init, true);
  }
  if (!res.ok) throw await errorFrom(res);
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  return (text ? JSON.parse(text) : undefined) as T;
}

export function errorMessage(err: unknown): string {
  if (err instanceof Error) return err.message;
  return 'Something went wrong. Reload the page and try again.';
}
