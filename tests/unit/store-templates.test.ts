import { describe, expect, it } from "vitest";
import { TEMPLATES, findTemplate } from "@/lib/templates";
import { validateChain, validateDraft } from "@/lib/chain/schema";

describe("TEMPLATES", () => {
  it("offers a blank sheet that is a valid draft with nothing on it", () => {
    const blank = findTemplate("blank")!.make();
    expect(blank.nodes).toEqual([]);
    expect(validateDraft(blank).ok).toBe(true);
  });

  for (const t of TEMPLATES.filter((t) => t.key !== "blank")) {
    it(`${t.key} is a complete chain by the shared schema`, () => {
      const r = validateChain(t.make());
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      expect(r.chain.nodes.some((n) => n.kind === "adc")).toBe(true);
    });
  }

  it("hands out a fresh copy each time", () => {
    const t = findTemplate("hull-vibration")!;
    const a = t.make();
    const charge = a.nodes[0].params.amplitude;
    expect(charge).toBeGreaterThan(0);
    a.nodes[0].params.amplitude = 3;
    expect(t.make().nodes[0].params.amplitude).toBe(charge);
  });
});

describe("TEMPLATES as starting points", () => {
  it("start with every op-amp stage and converter clear of its rails", async () => {
    const { analyseDraft } = await import("@/lib/store/live-analysis");
    for (const t of TEMPLATES.filter((x) => x.key !== "blank")) {
      const live = analyseDraft(t.make());
      const statuses = [...Object.values(live.stageById).map((s) => s.status), ...Object.values(live.adcById).map((a) => a.status)];
      expect(statuses.filter(Boolean).every((s) => s === "ok"), `${t.key}: ${statuses.join(",")}`).toBe(true);
    }
  });
});
