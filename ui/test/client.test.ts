// The API client's session rules, checked against a scripted HTTP exchange that follows the
// service's contract: 401 on an expired access token, POST /api/auth/refresh rotates the refresh
// cookie (so a second, parallel refresh would present a spent one and be refused).
import {
  api,
  ApiError,
  hasAccessToken,
  onSessionChange,
  refreshSession,
  setSession,
} from '../src/api/client';

type Call = { method: string; path: string; auth: string | null };

function serviceLike(opts: { raceFirstRefresh?: boolean } = {}) {
  const calls: Call[] = [];
  let validToken = 'token-1';
  let refreshes = 0;
  let raced = false;
  const json = (status: number, body: unknown) =>
    new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
  const fetchImpl = async (input: RequestInfo | URL, init?: RequestInit): Promise<Response> => {
    const path = String(input);
    const method = init?.method ?? 'GET';
    const auth = new Headers(init?.headers).get('Authorization');
    calls.push({ method, path, auth });
    await new Promise((r) => setTimeout(r, 5));
    if (path === '/api/auth/refresh') {
      if (opts.raceFirstRefresh && !raced) {
        // another tab of this browser refreshed a moment earlier with the same cookie
        raced = true;
        return json(401, {
          statusCode: 401,
          message: 'Your session was just renewed in another tab.',
        });
      }
      refreshes += 1;
      // a rotated cookie is single-use: only the first refresh in this exchange succeeds
      if (refreshes > 1) return json(401, { statusCode: 401, message: 'Sign in again.' });
      validToken = 'token-2';
      return json(200, { accessToken: validToken, expiresIn: 900, user: { id: 'u1' } });
    }
    if (auth !== `Bearer ${validToken}`)
      return json(401, { statusCode: 401, message: 'Your session has expired.' });
    if (path === '/api/manuscripts/bad')
      return json(400, {
        statusCode: 400,
        message: ['title must be shorter than 300 characters.', 'Shorten it.'],
      });
    if (method === 'DELETE') return new Response(null, { status: 204 });
    return json(200, { path });
  };
  return { calls, fetchImpl, refreshCount: () => refreshes };
}

const realFetch = globalThis.fetch;
afterEach(() => {
  globalThis.fetch = realFetch;
  setSession(null);
});

test('parallel requests with an expired token share one refresh, then retry with the new token', async () => {
  const svc = serviceLike();
  globalThis.fetch = svc.fetchImpl as typeof fetch;
  setSession({ accessToken: 'expired', expiresIn: 0, user: {} as never });
  const results = await Promise.all([
    api<{ path: string }>('/api/manuscripts'),
    api<{ path: string }>('/api/auth/me'),
    api<{ path: string }>('/api/manuscripts/m1/members'),
  ]);
  expect(results.map((r) => r.path)).toEqual([
    '/api/manuscripts',
    '/api/auth/me',
    '/api/manuscripts/m1/members',
  ]);
  expect(svc.refreshCount()).toBe(1);
  const retried = svc.calls.filter(
    (c) => c.path !== '/api/auth/refresh' && c.auth === 'Bearer token-2',
  );
  expect(retried).toHaveLength(3);
});

test('a failed refresh signs the user out and surfaces the 401 as a sentence', async () => {
  const svc = serviceLike();
  globalThis.fetch = svc.fetchImpl as typeof fetch;
  await refreshSession(); // spends the one good refresh
  setSession({ accessToken: 'expired', expiresIn: 0, user: {} as never });
  const seen: Array<unknown> = [];
  const off = onSessionChange((s) => seen.push(s));
  await expect(api('/api/manuscripts')).rejects.toMatchObject({
    status: 401,
    message: 'Your session has expired.',
  });
  off();
  expect(seen).toContain(null);
  expect(hasAccessToken()).toBe(false);
});

test('public routes never send a token nor try a refresh', async () => {
  const svc = serviceLike();
  globalThis.fetch = svc.fetchImpl as typeof fetch;
  setSession({ accessToken: 'token-1', expiresIn: 900, user: {} as never });
  await expect(api('/api/invitations/x', { anonymous: true })).rejects.toBeInstanceOf(ApiError);
  expect(svc.calls).toEqual([{ method: 'GET', path: '/api/invitations/x', auth: null }]);
});

test('validation messages arrive as a list and are joined into one text; 204 gives undefined', async () => {
  const svc = serviceLike();
  globalThis.fetch = svc.fetchImpl as typeof fetch;
  setSession({ accessToken: 'token-1', expiresIn: 900, user: {} as never });
  await expect(api('/api/manuscripts/bad')).rejects.toMatchObject({
    status: 400,
    message: 'title must be shorter than 300 characters. Shorten it.',
  });
  await expect(
    api('/api/manuscripts/m1/members/u2', { method: 'DELETE' }),
  ).resolves.toBeUndefined();
});

test('an unreachable server becomes an actionable sentence', async () => {
  globalThis.fetch = (async () => {
    throw new TypeError('fetch failed');
  }) as typeof fetch;
  await expect(api('/api/manuscripts', { anonymous: true })).rejects.toMatchObject({
    status: 0,
    message: expect.stringMatching(/could not reach its server.*try again/i),
  });
});

test('a refresh that lost a race with another tab is tried once more and succeeds', async () => {
  const svc = serviceLike({ raceFirstRefresh: true });
  globalThis.fetch = svc.fetchImpl as typeof fetch;
  setSession({ accessToken: 'expired', expiresIn: 0, user: {} as never });
  await expect(api<{ path: string }>('/api/manuscripts')).resolves.toEqual({
    path: '/api/manuscripts',
  });
  expect(svc.calls.filter((c) => c.path === '/api/auth/refresh')).toHaveLength(2);
  expect(hasAccessToken()).toBe(true);
});

test('a first visit without a session asks for a refresh once, not twice', async () => {
  const svc = serviceLike({ raceFirstRefresh: true });
  globalThis.fetch = svc.fetchImpl as typeof fetch;
  await expect(refreshSession()).resolves.toBeNull();
  expect(svc.calls.filter((c) => c.path === '/api/auth/refresh')).toHaveLength(1);
});
