import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, makeNonce, sameOriginProblem, staticSecurityHeaders } from "@/lib/security/headers";
import { apiRoute, crossSiteRefusal } from "@/lib/api/handler";
import { config as proxyConfig, proxy } from "@/proxy";
import { NextRequest } from "next/server";

function directives(policy: string): Map<string, string[]> {
  return new Map(policy.split(";").map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name, values]));
}

describe("makeNonce", () => {
  it("gives 128 random bits as base64, different every time", () => {
    const seen = new Set(Array.from({ length: 200 }, makeNonce));
    expect(seen.size).toBe(200);
    for (const n of seen) {
      expect(n).toMatch(/^[A-Za-z0-9+/]{22}==$/);
      expect(atob(n)).toHaveLength(16);
    }
  });
});

describe("contentSecurityPolicy", () => {
  const prod = directives(contentSecurityPolicy("abc123==", { dev: false }));

  it("allows scripts only by this response's nonce and what they load, never inline or eval in production", () => {
    expect(prod.get("script-src")).toEqual(["'self'", "'nonce-abc123=='", "'strict-dynamic'"]);
    expect(prod.get("script-src")).not.toContain("'unsafe-inline'");
    expect(prod.get("script-src")).not.toContain("'unsafe-eval'");
  });

  it("forbids framing, plugins and foreign form targets; workers only from this origin", () => {
    expect(prod.get("frame-ancestors")).toEqual(["'none'"]);
    expect(prod.get("object-src")).toEqual(["'none'"]);
    expect(prod.get("form-action")).toEqual(["'self'"]);
    expect(prod.get("base-uri")).toEqual(["'self'"]);
    expect(prod.get("worker-src")).toEqual(["'self'"]);
    expect(prod.get("default-src")).toEqual(["'self'"]);
    expect(prod.get("connect-src")).toEqual(["'self'"]);
  });

  it("adds eval and the reload socket only for next dev", () => {
    const dev = directives(contentSecurityPolicy("n", { dev: true }));
    expect(dev.get("script-src")).toContain("'unsafe-eval'");
    expect(dev.get("connect-src")).toContain("ws:");
  });
});

describe("staticSecurityHeaders", () => {
  it("sets nosniff, a referrer policy, no framing, and HSTS in production only", () => {
    const prod = Object.fromEntries(staticSecurityHeaders(true).map((h) => [h.key, h.value]));
    expect(prod["X-Content-Type-Options"]).toBe("nosniff");
    expect(prod["Referrer-Policy"]).toBe("strict-origin-when-cross-origin");
    expect(prod["X-Frame-Options"]).toBe("DENY");
    expect(prod["Strict-Transport-Security"]).toMatch(/^max-age=\d{7,}/);
    expect(staticSecurityHeaders(false).map((h) => h.key)).not.toContain("Strict-Transport-Security");
  });
});

describe("sameOriginProblem", () => {
  const h = (o: Record<string, string>) => new Headers(o);
  it("accepts the site's own pages and clients that are no browser", () => {
    expect(sameOriginProblem(h({ host: "app.example:3000", origin: "https://app.example:3000", "sec-fetch-site": "same-origin" }))).toBeNull();
    expect(sameOriginProblem(h({ host: "app.example" }))).toBeNull(); // curl, the CLI, the load test
    expect(sameOriginProblem(h({ host: "internal:3000", "x-forwarded-host": "app.example", origin: "https://app.example" }))).toBeNull();
    expect(sameOriginProblem(h({ host: "app.example", "sec-fetch-site": "none" }))).toBeNull(); // typed into the address bar
  });
  it("names what gave another site away", () => {
    expect(sameOriginProblem(h({ host: "app.example", origin: "https://evil.example" }))).toMatch(/evil\.example/);
    expect(sameOriginProblem(h({ host: "app.example", "sec-fetch-site": "cross-site" }))).toMatch(/cross-site/);
    expect(sameOriginProblem(h({ host: "app.example", "sec-fetch-site": "same-site", origin: "https://app.example" }))).toMatch(/same-site/);
    expect(sameOriginProblem(h({ host: "app.example", origin: "null" }))).toMatch(/null/);
    expect(sameOriginProblem(h({ host: "app.example", origin: "https://app.example.evil.example" }))).not.toBeNull();
  });
});

describe("apiRoute's same-origin check", () => {
  const handler = apiRoute(async () => Response.json({ ran: true }));
  const req = (method: string, headers: Record<string, string>) => new Request("http://app.example/api/x", { method, headers });

  it("refuses a state-changing request from another site with 403 before the handler runs", async () => {
    for (const method of ["POST", "PUT", "PATCH", "DELETE"]) {
      const res = await handler(req(method, { host: "app.example", origin: "https://evil.example" }), undefined);
      expect(res.status, method).toBe(403);
      expect(await res.json()).toEqual({ error: expect.stringMatching(/another site/) });
    }
  });
  it("lets reads through from anywhere (they change nothing) and writes from the same site", async () => {
    expect((await handler(req("GET", { host: "app.example", origin: "https://evil.example" }), undefined)).status).toBe(200);
    expect((await handler(req("POST", { host: "app.example", origin: "http://app.example" }), undefined)).status).toBe(200);
    expect(crossSiteRefusal(req("POST", { host: "app.example" }))).toBeNull();
  });
});

describe("proxy", () => {
  it("puts a fresh policy with a new nonce on every page, on the response and for Next on the request", () => {
    const a = proxy(new NextRequest("http://localhost/sign-in"));
    const b = proxy(new NextRequest("http://localhost/sign-in"));
    const pa = a.headers.get("content-security-policy")!;
    expect(pa).toMatch(/script-src 'self' 'nonce-[^']+' 'strict-dynamic'/);
    expect(pa).not.toBe(b.headers.get("content-security-policy"));
    // NextResponse.next({ request: { headers } }) passes the changed request headers on like this
    expect(a.headers.get("x-middleware-request-content-security-policy")).toBe(pa);
    expect(a.headers.get("x-middleware-request-x-nonce")).toBe(pa.match(/'nonce-([^']+)'/)![1]);
  });
  it("still sends signed-out visitors of workspace pages to sign-in", () => {
    const res = proxy(new NextRequest("http://localhost/chains/abc?x=1"));
    expect(res.status).toBe(307);
    expect(new URL(res.headers.get("location")!).searchParams.get("callbackUrl")).toBe("/chains/abc?x=1");
    const signedIn = new NextRequest("http://localhost/chains", { headers: { cookie: "authjs.session-token=x" } });
    expect(proxy(signedIn).headers.get("content-security-policy")).toBeTruthy();
  });
  it("runs on pages and on any address with a %, never on a route handler's ordinary path, a file or the build's output", () => {
    const sources = proxyConfig.matcher.map((m) => new RegExp(`^${typeof m === "string" ? m : m.source}$`));
    const reaches = (p: string) => sources.some((r) => r.test(p));
    for (const p of ["/", "/sign-in", "/chains/abc", "/mailbox", "/invitation/tok", "/chains/%E0", "/api/chains/%E0", "/api/x/%E0.csv"]) expect(reaches(p), p).toBe(true);
    // Next gives the proxy at most 10 MB of a request body and cuts the rest; uploads are larger
    for (const p of ["/api/chains", "/api/chains/abc/uploads", "/_next/static/chunks/a.js", "/icon.svg", "/examples/a.csv"]) expect(reaches(p), p).toBe(false);
    for (const url of ["http://localhost/api/chains/a%20b", "http://localhost/examples/a%20b.csv"]) {
      const res = proxy(new NextRequest(url));
      expect(res.headers.get("content-security-policy"), url).toBeNull();
      expect(res.headers.get("x-middleware-next"), url).toBe("1");
    }
    const prefetch = proxy(new NextRequest("http://localhost/chains/a%20b", { headers: { "next-router-prefetch": "1" } }));
    expect(prefetch.status).toBe(200);
    expect(prefetch.headers.get("content-security-policy")).toBeNull();
  });
  it("refuses an address with a broken percent-encoding with 400 naming the address, before Next's own decoding answers 500", async () => {
    for (const path of ["/api/chains/%E0%A4%A", "/api/chains/%ZZ/revisions", "/chains/%E0", "/chains/%E0/history", "/invitation/%C3", "/api/x/%E0.csv"]) {
      for (const headers of [{}, { cookie: "authjs.session-token=x" }, { "next-router-prefetch": "1" }] as Record<string, string>[]) {
        const res = proxy(new NextRequest(`http://localhost${path}`, { headers }));
        expect(res.status, path).toBe(400);
        expect((await res.json()).errors, path).toEqual([{ path: "url", message: expect.stringContaining("percent-encoding") }]);
      }
    }
    // a well-formed encoding goes on as before
    expect(proxy(new NextRequest("http://localhost/api/chains/a%20b")).status).toBe(200);
    expect(proxy(new NextRequest("http://localhost/chains/%C3%A9", { headers: { cookie: "authjs.session-token=x" } })).headers.get("content-security-policy")).toBeTruthy();
  });
});
