import { mkdtempSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { installSecret, loadConfig } from './app-config.js';

test('the install secret is generated once, private to the owner, and then reused', () => {
  const dir = join(mkdtempSync(join(tmpdir(), 'ff-secret-')), 'var');
  const first = installSecret(dir, {});
  expect(first).toMatch(/^[A-Za-z0-9_-]{64}$/); // 48 random bytes in base64url
  expect(statSync(join(dir, 'app-secret')).mode & 0o777).toBe(0o600);
  expect(installSecret(dir, {})).toBe(first);
  expect(readFileSync(join(dir, 'app-secret'), 'utf8')).toBe(first);
  // two installs never share one
  const other = installSecret(join(mkdtempSync(join(tmpdir(), 'ff-secret-')), 'var'), {});
  expect(other).not.toBe(first);
  expect(installSecret(dir, { FOLDFOLIO_JWT_SECRET: 'from-env' })).toBe('from-env');
});

test('a malformed port is refused with a sentence naming the variable', () => {
  const varDir = mkdtempSync(join(tmpdir(), 'ff-cfg-'));
  expect(() => loadConfig({ FOLDFOLIO_VAR: varDir, FOLDFOLIO_PORT: 'eighty' })).toThrow(
    /FOLDFOLIO_PORT must be a non-negative whole number; it is "eighty"/,
  );
  const cfg = loadConfig({ FOLDFOLIO_VAR: varDir, FOLDFOLIO_PORT: '8123' });
  expect(cfg.port).toBe(8123);
  expect(cfg.publicUrl).toBe('http://127.0.0.1:8123');
  // bcrypt cost never drops below 10 (OWASP password storage guidance)
  expect(loadConfig({ FOLDFOLIO_VAR: varDir, FOLDFOLIO_BCRYPT_COST: '4' }).bcryptCost).toBe(10);
});
