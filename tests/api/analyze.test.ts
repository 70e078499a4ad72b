import { describe, expect, it, vi } from "vitest";
import { jsonRequest, sessionModule, signInAs } from "./session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { POST } from "@/app/api/analyze/route";
import { ballastPressure, hullVibration } from "@/db/seed-data/chains";
import { makeUser } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(() => signInAs(makeUser("analyst")));

const post = (body?: unknown, raw?: string) => POST(jsonRequest("POST", "/api/analyze", body, raw), undefined);

describe("POST /api/analyze", () => {
  it("is for signed-in users only", async () => {
    signInAs(null);
    const res = await post({ chain: hullVibration });
    expect(res.status).toBe(401);
  });

  it("returns the analysis of a complete chain", async () => {
    const res = await post({ chain: hullVibration, points: 50 });
    expect(res.status).toBe(200);
    const result = await res.json();
    expect(result.format).toBe("chainwright.analysis/1");
    expect(result.paths).toHaveLength(1);
    expect(result.paths[0].nodes).toEqual(hullVibration.edges.reduce((ids, e) => [...ids, e.to], [hullVibration.edges[0].from]));
    expect(result.paths[0].response.f).toHaveLength(50);
  });

  it("evaluates at exactly the frequencies asked for", async () => {
    const res = await post({ chain: hullVibration, freqs: [10, 100, 1000] });
    expect(res.status).toBe(200);
    expect((await res.json()).paths[0].response.f).toEqual([10, 100, 1000]);
  });

  it("reports a chain that clips as a result, not an error", async () => {
    const res = await post({ chain: ballastPressure });
    expect(res.status).toBe(200);
    const result = await res.json();
    const gain = result.paths[0].stages.find((s: { id: string }) => s.id === "gain");
    expect(gain.status).toBe("clip");
    expect(result.warnings.some((w: { nodeId: string; code: string }) => w.nodeId === "gain" && w.code === "rail-clip")).toBe(true);
  });

  it("answers 400 with field paths for an invalid chain", async () => {
    const broken = structuredClone(hullVibration) as { nodes: Array<{ params: Record<string, unknown> }> };
    broken.nodes[2].params.rg = -1;
    const res = await post({ chain: broken });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.errors).toEqual(expect.arrayContaining([expect.objectContaining({ path: expect.stringContaining("nodes[2].params.rg") })]));
  });

  it("answers 400 for malformed JSON, an empty body or a missing chain", async () => {
    expect((await post(undefined, "{")).status).toBe(400);
    expect((await post(undefined, "")).status).toBe(400);
    const missing = await post({ points: 10 });
    expect(missing.status).toBe(400);
    expect((await missing.json()).errors.length).toBeGreaterThan(0);
  });

  it("answers 413 over 1 MB", async () => {
    const res = await post({ chain: { ...hullVibration, notes: "x".repeat(1_100_000) } });
    expect(res.status).toBe(413);
  });
});
