import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";

const ctx = e2eContext();

/** The nonce named in a policy's script-src. */
const nonceOf = (policy: string) => policy.match(/script-src[^;]*'nonce-([^']+)'/)?.[1];

describe.skipIf(ctx.skip !== null)("security headers and cookies (production build)", () => {
  const sessions = useBrowser();

  it("sends every page with a policy whose nonce is new each time and is on every script of the page", async () => {
    for (const pathname of ["/", "/sign-in", "/sign-up", "/mailbox"]) {
      const [a, b] = await Promise.all([fetch(ctx.baseUrl + pathname), fetch(ctx.baseUrl + pathname)]);
      expect(a.status, pathname).toBe(200);
      const policy = a.headers.get("content-security-policy") ?? "";
      expect(policy, pathname).toContain("frame-ancestors 'none'");
      expect(policy).toContain("'strict-dynamic'");
      expect(policy).not.toMatch(/script-src[^;]*'unsafe-(inline|eval)'/);
      const nonce = nonceOf(policy);
      expect(nonce).toBeTruthy();
      expect(nonceOf(b.headers.get("content-security-policy") ?? "")).not.toBe(nonce);
      expect(a.headers.get("x-content-type-options")).toBe("nosniff");
      expect(a.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(a.headers.get("x-frame-options")).toBe("DENY");
      expect(a.headers.get("x-powered-by")).toBeNull();
      const html = await a.text();
      const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
      expect(scripts.length, pathname).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag, pathname).toContain(`nonce="${nonce}"`);
    }
  });

  it("refuses a state-changing API request sent from another site, before looking at the session", async () => {
    const foreign = await fetch(`${ctx.baseUrl}/api/chains`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: "https://elsewhere.example" },
      body: JSON.stringify({ name: "Forged" }),
    });
    expect(foreign.status).toBe(403);
    expect((await foreign.json()).error).toMatch(/another site/);
    // the same request with no Origin (a script, not a browser) reaches the session check
    const plain = await fetch(`${ctx.baseUrl}/api/chains`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ name: "x" }) });
    expect(plain.status).toBe(401);
  });

  it("keeps the session in an httpOnly, Secure, SameSite cookie that page scripts cannot read", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    const session = (await context.cookies()).find((c) => c.name.includes("authjs.session-token"));
    expect(session).toBeDefined();
    expect(session!.name.startsWith("__Secure-")).toBe(true);
    expect(session!.httpOnly).toBe(true);
    expect(session!.secure).toBe(true);
    expect(session!.sameSite).toBe("Lax");
    expect(await page.evaluate(() => document.cookie)).not.toContain("session-token");
    await context.close();
  });
});
