// Where to go after sign-in: a path of this app, never another site (OWASP Unvalidated Redirects
// and Forwards Cheat Sheet). `next` is read by the WHATWG URL parser against the app's own origin,
// so dot segments, backslashes and percent-escapes are read as a browser reads them.
export function nextPath(next: unknown, origin: string): string {
  if (typeof next !== 'string' || !next.startsWith('/')) return '/'
  let url: URL
  try {
    url = new URL(next, origin)
  }
  catch {
    return '/'
  }
  if (url.origin !== origin) return '/'
  // The path must lead to itself once more: "//host" (left by "/.//host") is another site as a Location.
  const path = url.pathname + url.search + url.hash
  if (new URL(path, origin).href !== url.href) return '/'
  // The router decodes escapes: an escaped slash or backslash at the start would become "//" or
  // "/\" (another host), a control character could be dropped, and a broken escape would throw.
  let decoded: string
  try {
    decoded = decodeURIComponent(url.pathname)
  }
  catch {
    return '/'
  }
  // eslint-disable-next-line no-control-regex
  if (/^\/[/\\]/.test(decoded) || /[\u0000-\u001F\u007F]/.test(decoded)) return '/'
  return path
}
