import { afterEach, describe, expect, it, vi } from "vitest";
import { ApiFailure, fetchJson, problemText } from "@/lib/api/client/fetch-json";
import { ApiFailure as ChainsApiFailure, saveChain } from "@/lib/api/client/chains";

afterEach(() => vi.unstubAllGlobals());

function answer(status: number, text: string) {
  const fetchMock = vi.fn(async () => new Response(text, { status }));
  vi.stubGlobal("fetch", fetchMock);
  return fetchMock;
}

describe("fetchJson", () => {
  it("sends a body as JSON and resolves to the parsed answer", async () => {
    const fetchMock = answer(200, JSON.stringify({ ok: 1 }));
    await expect(fetchJson("/api/x", { method: "POST", body: { a: 1 } })).resolves.toEqual({ ok: 1 });
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe("/api/x");
    expect(init.method).toBe("POST");
    expect(init.body).toBe('{"a":1}');
    expect(init.headers).toEqual({ "content-type": "application/json" });
  });

  it("sends a GET without a body or content type", async () => {
    const fetchMock = answer(200, "");
    await expect(fetchJson("/api/x")).resolves.toEqual({});
    const init = (fetchMock.mock.calls[0] as unknown as [string, RequestInit])[1];
    expect(init.method).toBe("GET");
    expect(init.body).toBeUndefined();
    expect(init.headers).toEqual({});
  });

  it("turns a refusal into ApiFailure with the route's field errors", async () => {
    answer(400, JSON.stringify({ errors: [{ path: "name", message: "too long" }, { path: "", message: "bad" }] }));
    const e = await fetchJson("/api/x").catch((x: unknown) => x);
    expect(e).toBeInstanceOf(ApiFailure);
    expect((e as ApiFailure).status).toBe(400);
    expect(problemText(e)).toBe("name: too long; bad");
  });

  it("keeps a conflict's current version and says it is one", async () => {
    answer(409, JSON.stringify({ error: "stale", currentVersion: 7 }));
    const e = (await fetchJson("/api/x").catch((x: unknown) => x)) as ApiFailure;
    expect(e.isConflict).toBe(true);
    expect(e.body.currentVersion).toBe(7);
    expect(problemText(e)).toBe("stale");
  });

  it("names an answer that is not JSON, and a server that cannot be reached (status 0)", async () => {
    answer(502, "<html>gateway</html>");
    expect(problemText(await fetchJson("/api/x").catch((x: unknown) => x))).toBe("the server answered 502 without JSON");
    vi.stubGlobal("fetch", vi.fn(async () => Promise.reject(new TypeError("offline"))));
    const e = (await fetchJson("/api/x").catch((x: unknown) => x)) as ApiFailure;
    expect(e.status).toBe(0);
    expect(e.message).toContain("offline");
  });
});

describe("the chain client uses the same fetcher", () => {
  it("saves with PUT and the input minus its id, and refuses with the same ApiFailure class", async () => {
    expect(ChainsApiFailure).toBe(ApiFailure);
    const fetchMock = answer(200, JSON.stringify({ chain: { id: "c 1", version: 3 } }));
    await expect(saveChain({ id: "c 1", baseVersion: 2, document: { n: 1 } })).resolves.toEqual({ id: "c 1", version: 3 });
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe("/api/chains/c%201");
    expect(init.method).toBe("PUT");
    expect(JSON.parse(init.body as string)).toEqual({ baseVersion: 2, document: { n: 1 } });
    answer(409, JSON.stringify({ error: "stale", currentVersion: 4 }));
    await expect(saveChain({ id: "c", baseVersion: 2, document: {} })).rejects.toBeInstanceOf(ApiFailure);
  });
});
