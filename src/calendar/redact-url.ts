/**
 * A feed URL safe to print: scheme and host (with port) only. Paths, queries and user info of
 * calendar feed URLs often carry the secret that grants access, so they never reach logs or errors.
 */
export function redactUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.protocol === 'file:') return 'file:…';
    const hidden =
      u.pathname !== '/' || u.search !== '' || u.hash !== '' || u.username !== '' || u.password !== '';
    return `${u.protocol}//${u.host}${hidden ? '/…' : '/'}`;
  } catch {
    return '[unreadable URL]';
  }
}
