import { NextResponse, type NextRequest } from "next/server";

/**
 * First gate for signed-in pages: without a session cookie, go to sign-in and come back after.
 * This only looks for the cookie; the pages and every route handler check the session for
 * real (lib/auth), so a forged cookie gets no further than the layout's check.
 */
const SESSION_COOKIES = ["authjs.session-token", "__Secure-authjs.session-token"];

export function proxy(request: NextRequest) {
  const names = request.cookies.getAll().map((c) => c.name);
  const hasSession = names.some((n) => SESSION_COOKIES.some((s) => n === s || n.startsWith(`${s}.`)));
  if (hasSession) return NextResponse.next();
  const target = new URL("/sign-in", request.url);
  target.searchParams.set("callbackUrl", request.nextUrl.pathname + request.nextUrl.search);
  return NextResponse.redirect(target);
}

export const config = {
  matcher: ["/chains/:path*", "/chains", "/teams/:path*", "/teams", "/settings/:path*", "/settings", "/parts/:path*", "/parts"],
};
