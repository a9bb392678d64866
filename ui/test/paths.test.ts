// Where the app may send a user after sign-in or from a mail link. The cases are the classic
// open-redirect shapes (OWASP "Unvalidated Redirects and Forwards" cheat sheet).
import { appPathOf, safeNext } from '../src/routes/paths';

describe('safeNext', () => {
  test.each([
    ['/desk', '/desk'],
    ['/invitations/abc?x=1', '/invitations/abc?x=1'],
    ['//evil.example/desk', '/desk'],
    ['/\\evil.example', '/desk'],
    ['https://evil.example/', '/desk'],
    ['javascript:alert(1)', '/desk'],
    ['', '/desk'],
    [null, '/desk'],
  ])('%p → %p', (input, expected) => {
    expect(safeNext(input)).toBe(expected);
  });
});

describe('appPathOf', () => {
  const origin = 'http://127.0.0.1:5173';
  test('our invitation and reset links open in the app whatever host wrote them', () => {
    expect(appPathOf('http://127.0.0.1:8080/invitations/tok-EN_1', origin)).toBe(
      '/invitations/tok-EN_1',
    );
    expect(appPathOf('https://foldfolio.lab.example/reset-password/r3s3t', origin)).toBe(
      '/reset-password/r3s3t',
    );
  });
  test('other same-origin links keep their path and query', () => {
    expect(appPathOf('http://127.0.0.1:5173/desk?x=1', origin)).toBe('/desk?x=1');
  });
  test('foreign and non-http links stay outside the app', () => {
    expect(appPathOf('https://journal.example/guide', origin)).toBeNull();
    expect(appPathOf('javascript:alert(1)', origin)).toBeNull();
    expect(appPathOf('mailto:someone@lab.example', origin)).toBeNull();
    expect(appPathOf('http://evil.example/invitations/a/b', origin)).toBeNull();
  });
});
