import { NextResponse, type NextRequest } from "next/server";
import { contentSecurityPolicy, makeNonce } from "@/lib/security/headers";

/**
 * Runs before every page, and before any other address with a % in it (see `config.matcher`):
 *
 * 1. An address whose percent-encoding is broken ("/api/chains/%E0") is refused with 400, on pages,
 *    route handlers and files alike. Next decodes a dynamic segment with decodeURIComponent and answers
 *    its URIError with a bare 500 before any page or handler runs, so the refusal has to come first.
 *    Route handlers, files with an extension and router prefetches that reach the proxy for that check
 *    get nothing more from here: they carry no page of their own to protect.
 * 2. The content security policy with a fresh nonce. It goes on the response and also on the request
 *    headers, where Next finds it and puts the nonce on every script it renders; pages read it from
 *    `x-nonce` if they ever render a script of their own. Because the nonce changes per request, every
 *    page is rendered per request (the root layout reads the headers).
 * 3. The first gate for signed-in pages: without a session cookie, go to sign-in and come back after.
 *    This only looks for the cookie; the pages and every route handler check the session for real
 *    (lib/auth), so a forged cookie gets no further than the layout's check.
 */
const SESSION_COOKIES = ["authjs.session-token", "__Secure-authjs.session-token"];
const SIGNED_IN_PAGES = /^\/(chains|teams|settings|parts)(\/|$)/;
const NOT_A_PAGE = /^\/api\/|\.[A-Za-z0-9]+$/;
const BROKEN_ENCODING = "the address has a broken percent-encoding (a % not followed by the hex of valid UTF-8)";

export function proxy(request: NextRequest) {
  const { pathname } = request.nextUrl;
  if (!decodesCleanly(pathname)) {
    return Response.json({ error: `Bad request: ${BROKEN_ENCODING}.`, errors: [{ path: "url", message: BROKEN_ENCODING }] }, { status: 400 });
  }
  const prefetch = request.headers.has("next-router-prefetch") || request.headers.get("purpose") === "prefetch";
  if (NOT_A_PAGE.test(pathname) || prefetch) return NextResponse.next();

  if (SIGNED_IN_PAGES.test(pathname)) {
    const names = request.cookies.getAll().map((c) => c.name);
    const hasSession = names.some((n) => SESSION_COOKIES.some((s) => n === s || n.startsWith(`${s}.`)));
    if (!hasSession) {
      const target = new URL("/sign-in", request.url);
      target.searchParams.set("callbackUrl", request.nextUrl.pathname + request.nextUrl.search);
      return NextResponse.redirect(target);
    }
  }

  const nonce = makeNonce();
  const policy = contentSecurityPolicy(nonce, { dev: process.env.NODE_ENV === "development" });
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("Content-Security-Policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

function decodesCleanly(pathname: string): boolean {
  if (!pathname.includes("%")) return true;
  try {
    decodeURIComponent(pathname);
    return true;
  } catch {
    return false;
  }
}

export const config = {
  matcher: [
    {
      // every page; not route handlers, build output, or files with an extension (icon.svg, fonts)
      source: "/((?!api/|_next/static|_next/image|.*\\.[A-Za-z0-9]+$).*)",
      missing: [
        // router prefetches carry no HTML of their own to protect
        { type: "header", key: "next-router-prefetch" },
        { type: "header", key: "purpose", value: "prefetch" },
      ],
    },
    // Any other address with a percent sign, route handlers included, for the encoding check alone. Only
    // those: Next hands the proxy a copy of the request body of at most 10 MB and cuts the rest, and an
    // upload's body may be larger.
    "/(.*%.*)",
  ],
};
