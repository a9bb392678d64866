import request from 'supertest';
import { decodePayload, signHs256 } from './helpers/jwt.js';
import { linkIn, register, startTestApp, type TestApp, waitForMail } from './helpers/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => {
  await t?.close();
});

function refreshCookie(res: request.Response): string {
  const raw = res.headers['set-cookie'] as unknown as string[] | undefined;
  const c = (raw ?? []).find((s) => s.startsWith('ff_refresh='));
  if (!c) throw new Error('no refresh cookie set');
  return c;
}

describe('register and sign in', () => {
  test('the first account is the admin, later ones are users; the cookie is httpOnly and scoped', async () => {
    const email = 'First.Person@Lab.Example ';
    const res = await request(t.server)
      .post('/api/auth/register')
      .send({ email, displayName: 'First Person', password: 'correct horse battery' })
      .expect(201);
    expect(res.body.user).toMatchObject({ email: 'first.person@lab.example', siteRole: 'admin' });
    expect(typeof res.body.accessToken).toBe('string');
    expect(res.body.expiresIn).toBe(t.cfg.accessTokenTtlSec);
    const cookie = refreshCookie(res);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/Path=\/api\/auth/);
    expect(cookie).toMatch(/SameSite=Strict/i);
    // the access token expires after the configured lifetime (RFC 7519 exp/iat, seconds)
    const claims = decodePayload(res.body.accessToken);
    expect(Number(claims.exp) - Number(claims.iat)).toBe(t.cfg.accessTokenTtlSec);

    const second = await register(t, 'Second');
    const me = await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${second.token}`)
      .expect(200);
    expect(me.body.siteRole).toBe('user');
  });

  test('the password is stored as a bcrypt hash, never in clear', async () => {
    const a = await register(t, 'Hashcheck');
    const rows: Array<{ password_hash: string }> = await t.db.query(
      'SELECT password_hash FROM users WHERE id = ?',
      [a.id],
    );
    expect(rows[0].password_hash).toMatch(/^\$2[aby]\$\d\d\$/);
    expect(rows[0].password_hash).not.toContain(a.password);
  });

  test('a second account with the same address is refused with a sentence', async () => {
    const a = await register(t, 'Dup');
    const res = await request(t.server)
      .post('/api/auth/register')
      .send({
        email: a.email.toUpperCase(),
        displayName: 'Dup again',
        password: 'another password',
      })
      .expect(409);
    expect(res.body.message).toMatch(/already exists.*Sign in/);
  });

  test('sign-in with the right password works, the wrong one says what to do', async () => {
    const a = await register(t, 'Signin');
    const ok = await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: a.email, password: a.password })
      .expect(200);
    expect(ok.body.user.id).toBe(a.id);
    const bad = await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: a.email, password: 'not the password' })
      .expect(401);
    expect(bad.body.message).toMatch(/do not match.*reset your password/);
    // an unknown address gets the very same answer (no account enumeration)
    const unknown = await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: 'nobody@lab.example', password: 'not the password' })
      .expect(401);
    expect(unknown.body.message).toBe(bad.body.message);
  });

  test('routes need a token; /me answers with it', async () => {
    const a = await register(t, 'Me');
    await request(t.server).get('/api/auth/me').expect(401);
    await request(t.server).get('/api/manuscripts').expect(401);
    const me = await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${a.token}`)
      .expect(200);
    expect(me.body.email).toBe(a.email);
  });
});

describe('refresh-token rotation', () => {
  test('each refresh issues a new token; replaying an old one ends the whole session family', async () => {
    const a = await register(t, 'Rotate');
    const first = await a.agent.post('/api/auth/refresh').expect(200);
    const c1 = refreshCookie(first);
    expect(first.body.user.id).toBe(a.id);

    const second = await a.agent.post('/api/auth/refresh').expect(200);
    const c2 = refreshCookie(second);
    expect(c2).not.toBe(c1);
    const cookieValue = (c: string) => c.split(';')[0];

    const liveCount = async () => {
      const rows: Array<{ n: number | string }> = await t.db.query(
        'SELECT COUNT(*) AS n FROM refresh_tokens WHERE user_id = ? AND revoked_at IS NULL',
        [a.id],
      );
      return Number(rows[0].n);
    };
    // right after rotation a replay is treated as two tabs racing: refused, nothing revoked
    const race = await request(t.server)
      .post('/api/auth/refresh')
      .set('Cookie', cookieValue(c1))
      .expect(401);
    expect(race.body.message).toMatch(/renewed in another tab/);
    expect(await liveCount()).toBe(1);
    // past the grace period a replay means someone kept a copy: the live token dies too
    await t.db.query(
      'UPDATE refresh_tokens SET revoked_at = revoked_at - INTERVAL 1 MINUTE WHERE user_id = ? AND revoked_at IS NOT NULL',
      [a.id],
    );
    const theft = await request(t.server)
      .post('/api/auth/refresh')
      .set('Cookie', cookieValue(c1))
      .expect(401);
    expect(theft.body.message).toMatch(/session has ended/);
    await request(t.server).post('/api/auth/refresh').set('Cookie', cookieValue(c2)).expect(401);
    expect(await liveCount()).toBe(0);
  });

  test('sign-out revokes the refresh token and clears the cookie', async () => {
    const a = await register(t, 'Signout');
    const out = await a.agent.post('/api/auth/sign-out').expect(204);
    expect(refreshCookie(out)).toMatch(/ff_refresh=;/);
    await a.agent.post('/api/auth/refresh').expect(401);
  });

  test('a forged or missing refresh cookie is refused', async () => {
    await request(t.server).post('/api/auth/refresh').expect(401);
    await request(t.server)
      .post('/api/auth/refresh')
      .set('Cookie', 'ff_refresh=00000000-0000-0000-0000-000000000000.forged')
      .expect(401);
  });
});

describe('password reset by e-mail link', () => {
  test('request → mail with link → new password works, old one and old tokens do not', async () => {
    const a = await register(t, 'Reset');
    const res = await request(t.server)
      .post('/api/auth/password-reset')
      .send({ email: a.email })
      .expect(202);
    expect(res.body.message).toMatch(/reset link is on its way/);
    const mail = await waitForMail(t, a.email, /Reset your Foldfolio password/);
    const link = linkIn(mail.text, '/reset-password/');
    expect(link.startsWith(`${t.cfg.publicUrl}/reset-password/`)).toBe(true);
    const token = decodeURIComponent(link.split('/reset-password/')[1]);

    await request(t.server)
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'a brand new passphrase' })
      .expect(204);
    await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: a.email, password: a.password })
      .expect(401);
    await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: a.email, password: 'a brand new passphrase' })
      .expect(200);
    // the access token from before the reset no longer works, nor does the old refresh cookie
    await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${a.token}`)
      .expect(401);
    await a.agent.post('/api/auth/refresh').expect(401);
    // the link works once
    const again = await request(t.server)
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'yet another passphrase' })
      .expect(400);
    expect(again.body.message).toMatch(/invalid, expired or already used.*Ask for a new one/);
  });

  test('an expired reset link is refused', async () => {
    const a = await register(t, 'Expired');
    await request(t.server).post('/api/auth/password-reset').send({ email: a.email }).expect(202);
    const mail = await waitForMail(t, a.email, /Reset your Foldfolio password/);
    const token = decodeURIComponent(
      linkIn(mail.text, '/reset-password/').split('/reset-password/')[1],
    );
    await t.db.query(
      'UPDATE password_resets SET expires_at = NOW(3) - INTERVAL 1 MINUTE WHERE user_id = ?',
      [a.id],
    );
    await request(t.server)
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'a brand new passphrase' })
      .expect(400);
  });

  test('an unknown address gets the same answer and no mail is sent', async () => {
    await request(t.server)
      .post('/api/auth/password-reset')
      .send({ email: 'nobody.here@lab.example' })
      .expect(202);
    await new Promise((r) => setTimeout(r, 300));
    const rows: unknown[] = await t.db.query('SELECT id FROM mail_messages WHERE to_addrs = ?', [
      'nobody.here@lab.example',
    ]);
    expect(rows).toHaveLength(0);
  });
});

describe('abuse', () => {
  test(`wrong password ${'×'}N: after the limit even the right password is throttled`, async () => {
    const a = await register(t, 'Throttle');
    for (let i = 0; i < t.cfg.signInLimit; i++) {
      await request(t.server)
        .post('/api/auth/sign-in')
        .send({ email: a.email, password: `wrong guess ${i}` })
        .expect(401);
    }
    const res = await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: a.email, password: a.password })
      .expect(429);
    expect(res.body.message).toMatch(/Too many attempts.*Wait \d+ seconds/);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    // another account from the same client is not locked out
    const b = await register(t, 'Neighbour');
    await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: b.email, password: b.password })
      .expect(200);
  });

  test('a tampered access token is refused', async () => {
    const a = await register(t, 'Tamper');
    const b = await register(t, 'Victim');
    const [h, , s] = a.token.split('.');
    const payload = { ...decodePayload(a.token), sub: b.id };
    const forged = `${h}.${Buffer.from(JSON.stringify(payload)).toString('base64url')}.${s}`;
    await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${forged}`)
      .expect(401);
    // signed with another key
    const otherKey = signHs256(decodePayload(a.token), 'not-the-install-secret');
    await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${otherKey}`)
      .expect(401);
    // "alg: none"
    const none = `${Buffer.from('{"alg":"none","typ":"JWT"}').toString('base64url')}.${Buffer.from(JSON.stringify(payload)).toString('base64url')}.`;
    await request(t.server).get('/api/auth/me').set('Authorization', `Bearer ${none}`).expect(401);
    // garbage
    await request(t.server).get('/api/auth/me').set('Authorization', 'Bearer abc.def').expect(401);
  });

  test('an expired access token is refused, a correctly signed fresh one accepted', async () => {
    const a = await register(t, 'Clock');
    const now = Math.floor(Date.now() / 1000);
    const base = { sub: a.id, tv: 0, iss: 'foldfolio' };
    const expired = signHs256({ ...base, iat: now - 3600, exp: now - 60 }, t.cfg.jwtSecret);
    const fresh = signHs256({ ...base, iat: now, exp: now + 60 }, t.cfg.jwtSecret);
    await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${expired}`)
      .expect(401);
    await request(t.server).get('/api/auth/me').set('Authorization', `Bearer ${fresh}`).expect(200);
  });

  test('the token of a deleted account is refused', async () => {
    const admin = await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: 'first.person@lab.example', password: 'correct horse battery' })
      .expect(200);
    const doomed = await register(t, 'Doomed');
    await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${doomed.token}`)
      .expect(200);
    await request(t.server)
      .delete(`/api/admin/users/${doomed.id}`)
      .set('Authorization', `Bearer ${admin.body.accessToken}`)
      .expect(204);
    const res = await request(t.server)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${doomed.token}`)
      .expect(401);
    expect(res.body.message).toMatch(/Sign in again/);
    await doomed.agent.post('/api/auth/refresh').expect(401);
  });
});
