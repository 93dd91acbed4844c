/*
 * The path an access log line shows. Links that are their own credential carry a secret in the path:
 * a one-time welcome link (older form), a proposal link (/p/<token>, /p/<token>.pdf, …/opened) and a
 * crew member's calendar feed (/calendar/<token>.ics). Logs are read by more people than the links are
 * meant for, so the secret is replaced; the query string is never logged at all.
 */
const SECRET_PATHS: [RegExp, string][] = [
  [/^\/welcome\/[^/]+/, "/welcome/…"],
  [/^\/p\/[^/.]+/, "/p/…"],
  [/^\/calendar\/[^/.]+/, "/calendar/…"],
];

export function accessLogPath(rawUrl: string): string {
  const q = rawUrl.indexOf("?");
  let path = q === -1 ? rawUrl : rawUrl.slice(0, q);
  for (const [pattern, replacement] of SECRET_PATHS) path = path.replace(pattern, replacement);
  return path;
}
