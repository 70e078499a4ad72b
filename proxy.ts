import { NextResponse, type NextRequest } from "next/server";
import { contentSecurityPolicy, makeNonce } from "@/lib/security/headers";

/**
 * Runs before every page (not route handlers or static files, see `config.matcher`):
 *
 * 1. The content security policy with a fresh nonce. It goes on the response and also on the request
 *    headers, where Next finds it and puts the nonce on every script it renders; pages read it from
 *    `x-nonce` if they ever render a script of their own. Because the nonce changes per request, every
 *    page is rendered per request (the root layout reads the headers).
 * 2. The first gate for signed-in pages: without a session cookie, go to sign-in and come back after.
 *    This only looks for the cookie; the pages and every route handler check the session for real
 *    (lib/auth), so a forged cookie gets no further than the layout's check.
 */
const SESSION_COOKIES = ["authjs.session-token", "__Secure-authjs.session-token"];
const SIGNED_IN_PAGES = /^\/(chains|teams|settings|parts)(\/|$)/;

export function proxy(request: NextRequest) {
  if (SIGNED_IN_PAGES.test(request.nextUrl.pathname)) {
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
  ],
};
