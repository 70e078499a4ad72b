/**
 * The browser-facing security policy, in one place: the content security policy that proxy.ts puts on
 * every page (with a fresh nonce per request) and the fixed headers next.config.ts adds to every
 * response. No Node or Next imports: proxy.ts runs it, and tests call it directly.
 */

/** A fresh, unguessable nonce (128 random bits, base64) for one page response. */
export function makeNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  let text = "";
  for (const b of bytes) text += String.fromCharCode(b);
  return btoa(text);
}

export interface CspOptions {
  /** `next dev` evaluates code for its error overlay and fast refresh, which needs 'unsafe-eval' */
  dev: boolean;
}

/**
 * The content security policy of one page response.
 *
 * - Scripts: only those carrying this response's nonce (Next puts it on its own scripts when it finds
 *   the policy in the request headers), and what they load ('strict-dynamic': the route chunks,
 *   Plotly's chunk, the analysis workers). No inline handlers, no eval in production.
 * - Styles: 'unsafe-inline' is allowed for styles only. React renders `style` attributes into the
 *   server HTML, and React Flow and Plotly add `<style>` rules while running; neither can carry a
 *   nonce. A style can change how the page looks but cannot run code.
 * - Workers from this origin only; images also as data:/blob: URLs (Plotly's image export).
 * - No plugins, no framing by anyone (frame-ancestors 'none'), forms and <base> to this origin only.
 */
export function contentSecurityPolicy(nonce: string, { dev }: CspOptions): string {
  const directives: [string, string[]][] = [
    ["default-src", ["'self'"]],
    ["script-src", ["'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...(dev ? ["'unsafe-eval'"] : [])]],
    ["style-src", ["'self'", "'unsafe-inline'"]],
    ["img-src", ["'self'", "data:", "blob:"]],
    ["font-src", ["'self'", "data:"]],
    ["connect-src", ["'self'", ...(dev ? ["ws:"] : [])]],
    ["worker-src", ["'self'"]],
    ["manifest-src", ["'self'"]],
    ["media-src", ["'self'"]],
    ["frame-src", ["'none'"]],
    ["object-src", ["'none'"]],
    ["base-uri", ["'self'"]],
    ["form-action", ["'self'"]],
    ["frame-ancestors", ["'none'"]],
  ];
  return directives.map(([name, values]) => `${name} ${values.join(" ")}`).join("; ");
}

/**
 * Headers for every response (pages, route handlers, static files), set in next.config.ts.
 * Strict-Transport-Security only in production, where the app is served over HTTPS (browsers ignore
 * it over plain HTTP anyway).
 */
export function staticSecurityHeaders(production: boolean): { key: string; value: string }[] {
  return [
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    { key: "Cross-Origin-Resource-Policy", value: "same-origin" },
    { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=(), usb=(), interest-cohort=()" },
    ...(production ? [{ key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" }] : []),
  ];
}

/** The methods that change something; route handlers answering them must see a same-origin request. */
export const STATE_CHANGING_METHODS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * Whether a state-changing request comes from this application's own pages (or from a client that is
 * no browser at all). A browser always sends `Origin` on a POST/PUT/PATCH/DELETE fetch or form post
 * and `Sec-Fetch-Site` on every request; a request from another site's page shows it in either one,
 * and that is the cross-site request forgery this refuses. A request with neither header comes from a
 * script or the command line (curl, the load test), which holds no victim's cookies, so it passes on
 * to the session check like any other.
 *
 * The expected host is the request's own `Host` (or `X-Forwarded-Host` behind a proxy that sets it).
 */
export function sameOriginProblem(headers: Headers): string | null {
  const origin = headers.get("origin");
  const site = headers.get("sec-fetch-site");
  if (site && site !== "same-origin" && site !== "none") return `Sec-Fetch-Site is ${site}`;
  if (origin === null) return null;
  if (origin === "null") return "Origin is null";
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    return "Origin is not a URL";
  }
  const hosts = [headers.get("host"), ...(headers.get("x-forwarded-host") ?? "").split(",")]
    .map((h) => h?.trim().toLowerCase())
    .filter((h): h is string => !!h);
  if (hosts.length === 0) return "no Host header";
  return hosts.includes(originHost.toLowerCase()) ? null : `Origin ${origin} is not this site`;
}
