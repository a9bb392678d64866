// Pure helpers for where the app may send a user (kept free of React so they are unit-tested).

/** Where to go after signing in: only same-site paths, so a crafted link cannot send users away. */
export function safeNext(next: string | null | undefined, fallback = '/desk'): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\'))
    return fallback;
  return next;
}

// Links in our own mails point at these pages; they open inside the app whatever host name the
// mail was written with (the service's public URL may differ from the address in the browser).
const APP_LINK = /^\/(invitations|reset-password)\/[^/?#]+$/;

/** The in-app path for a link found in a mail, or null when it must open as an outside link. */
export function appPathOf(href: string, origin: string): string | null {
  try {
    const url = new URL(href, origin);
    if (url.protocol !== 'http:' && url.protocol !== 'https:') return null;
    if (APP_LINK.test(url.pathname)) return url.pathname;
    return url.origin === origin ? url.pathname + url.search : null;
  } catch {
    return null;
  }
}
