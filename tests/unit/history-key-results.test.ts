import { describe, expect, it } from "vitest";
import { ballastPressure, hullVibration } from "@/db/seed-data/chains";
import { diffKeyResults, keyResults } from "@/lib/history/key-results";

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

describe("keyResults", () => {
  it("gives the anti-alias stage's natural frequency, 1/(2π·√(R1·R2·C1·C2)) (derived from the Sallen-Key formula in chain-format.md)", () => {
    const k = keyResults(hullVibration);
    expect(k.note).toBeNull();
    expect(k.paths).toHaveLength(1);
    const aa = k.paths[0].corners.find((c) => c.id === "aa")!;
    const expected = 1 / (2 * Math.PI * Math.sqrt(10e3 * 10e3 * 10e-9 * 4.7e-9)); // ≈ 2321 Hz
    expect(aa.f0).toBeCloseTo(expected, 0);
    expect(k.paths[0].end).toBe("adc");
    expect(k.worstStatus).not.toBe("clip");
  });

  it("finds the ballast chain clipping at DC, with a negative worst margin", () => {
    const k = keyResults(ballastPressure);
    expect(k.worstStatus).toBe("clip");
    expect(k.paths[0].worstMarginV).toBeLessThan(0);
  });

  it("analyses only the complete part of a draft and says what was left out", () => {
    const draft = clone(hullVibration) as { nodes: Array<{ id: string; params: Record<string, unknown> }> };
    delete draft.nodes.find((n) => n.id === "aa")!.params.r1;
    const k = keyResults(draft);
    expect(k.note).toMatch(/left out/);
    expect(keyResults({ format: "chainwright.chain/1", name: "Empty", nodes: [], edges: [] })).toEqual({ paths: [], worstStatus: null, note: expect.any(String) });
  });
});

describe("diffKeyResults", () => {
  it("is empty for the same chain and names the DC gain change when the gain resistor changes", () => {
    expect(diffKeyResults(keyResults(ballastPressure), keyResults(ballastPressure))).toEqual([]);
    const lower = clone(ballastPressure) as unknown as { nodes: Array<{ kind: string; params: Record<string, number> }> };
    const stage = lower.nodes.find((n) => n.kind === "inAmp")!;
    stage.params.rg = stage.params.rg * 10;
    const changes = diffKeyResults(keyResults(ballastPressure), keyResults(lower));
    const gain = changes.find((c) => c.figure === "DC gain");
    expect(gain).toBeDefined();
    expect(gain!.old).not.toBe(gain!.new);
    expect(changes.some((c) => c.figure === "worst margin")).toBe(true);
  });
});
