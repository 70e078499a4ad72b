/**
 * The design report's spread summary against the engine: every figure it carries is the one
 * lib/engine/spread.ts gives for the same chain, options and seed (demo chains, expectations from the
 * engine on whatever they are, no pinned numbers), the picks (worst margin, parts that move most) are
 * what their rules say, and the printed report states how the spread was made and shows it.
 */
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { DesignReport } from "@/components/outputs/design-report";
import { figureText, share, spreadMethod } from "@/components/outputs/spread-summary";
import type { Chain } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine";
import { runSpread, type SpreadOptions, type SpreadSensitivity } from "@/lib/engine/spread";
import { REPORT_SPREAD, REPORT_TOP_PARTS, reportSpread, spreadSummary } from "@/lib/handoff";
import { demo } from "./handoff-support";

const OPTS: SpreadOptions = { trials: 60, seed: 4, points: 30 };
const relative = (s: SpreadSensitivity) => Math.max(s.effect.dcGain ?? 0, s.effect.f0 ?? 0, s.effect.q ?? 0);
const text = (html: string) => html.replace(/<[^>]+>/g, " ").replace(/&quot;/g, '"').replace(/&#x27;/g, "'").replace(/\s+/g, " ");

describe("spreadSummary against runSpread", () => {
  for (const name of ["hull", "ballast", "turbidity"] as const) {
    it(`${name}: per-stage figures, clip shares, worst margin and the parts that move most are the engine's`, () => {
      const chain = demo()[name];
      const s = spreadSummary(chain, OPTS);
      const r = runSpread(chain, OPTS);
      expect(s).toMatchObject({ trials: 60, seed: 4, distribution: "uniform", parts: r.parts.length, clipCount: r.clipCount, clipShare: r.clipShare, criticalNode: r.criticalNode });
      expect(s.stages.map((x) => x.id)).toEqual(r.stages.map((x) => x.id));
      s.stages.forEach((st, i) => {
        const e = r.stages[i];
        expect(st.clipShare).toBe(e.clipShare);
        const expected = (["dcGain", "f0", "q", "margin"] as const).filter((m) => e[m] && e[m]!.count > 0);
        expect(st.figures.map((f) => f.metric)).toEqual(expected);
        for (const f of st.figures) {
          const stat = e[f.metric]!;
          expect(f).toEqual({ metric: f.metric, nominal: stat.nominal, p5: stat.p5, p95: stat.p95, min: stat.min, max: stat.max, count: stat.count });
          expect(f.min).toBeLessThanOrEqual(f.p5);
          expect(f.p95).toBeLessThanOrEqual(f.max);
        }
      });
      // the worst margin is the lowest margin any stage reached in any build
      const lows = r.stages.filter((x) => x.margin && x.margin.count > 0).map((x) => ({ id: x.id, min: x.margin!.min, p5: x.margin!.p5 }));
      const worst = lows.reduce((a, b) => (b.min < a.min ? b : a), lows[0]);
      expect(s.worstMargin).toEqual(worst ? { nodeId: worst.id, min: worst.min, p5: worst.p5 } : null);
      // parts that move most: the engine's own entries, largest relative effect first, none left out that beats the last
      expect(s.top.length).toBeLessThanOrEqual(REPORT_TOP_PARTS);
      for (const p of s.top) expect(r.sensitivity).toContainEqual(p);
      for (let k = 1; k < s.top.length; k++) expect(relative(s.top[k])).toBeLessThanOrEqual(relative(s.top[k - 1]));
      const last = s.top.length ? relative(s.top[s.top.length - 1]) : Infinity;
      for (const p of r.sensitivity) if (!s.top.some((t) => t.key === p.key)) expect(relative(p)).toBeLessThanOrEqual(s.top.length < REPORT_TOP_PARTS ? 0 : last);
      const marginMax = Math.max(0, ...r.sensitivity.map((p) => p.effect.margin ?? 0));
      expect(s.marginPart?.effect.margin ?? 0).toBe(marginMax);
    });
  }

  it("the report's own run is 200 builds with seed 1 and gives the same summary every time", () => {
    expect(REPORT_SPREAD).toMatchObject({ trials: 200, seed: 1, distribution: "uniform" });
    const { turbidity } = demo();
    const a = reportSpread(turbidity);
    expect(a.ok).toBe(true);
    expect(reportSpread(turbidity)).toEqual(a);
    if (a.ok) expect(a.summary.trials).toBe(200);
  });

  it("with every tolerance at zero each figure's range is its nominal and no part moves anything", () => {
    const chain: Chain = structuredClone(demo().turbidity);
    chain.tolerances = { resistor: 0, capacitor: 0 };
    const s = spreadSummary(chain, { trials: 5, seed: 1, points: 10 });
    for (const st of s.stages) for (const f of st.figures) for (const x of [f.p5, f.p95, f.min, f.max]) expect(x).toBeCloseTo(f.nominal!, 12);
    expect(s.top).toEqual([]);
    expect(s.marginPart).toBeNull();
  });

  it("a chain the engine cannot spread gives the reason instead of throwing", () => {
    const chain = structuredClone(demo().hull);
    const broken = { ...chain, nodes: chain.nodes.slice(1) } as Chain;
    const r = reportSpread(broken);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason.length).toBeGreaterThan(0);
  });
});

describe("the design report's spread section", () => {
  it("states builds, seed and tolerances, and prints each stage's figures and the clip share from the summary", () => {
    const { hull } = demo();
    const html = renderToStaticMarkup(
      <DesignReport
        chainId="c"
        chain={hull}
        result={analyzeChain(hull)}
        revision={3}
        version={4}
        reviewState="draft"
        reviews={[]}
        generatedAt="2026-12-04 02:00"
        paper="a4"
      />,
    );
    const page = text(html);
    const r = reportSpread(hull);
    if (!r.ok) throw new Error(r.reason);
    const s = r.summary;
    expect(page).toContain("Spread from tolerances");
    expect(page).toContain(text(spreadMethod(s)));
    expect(page).toContain(`${s.trials} builds (seed ${s.seed})`);
    expect(page).toContain(s.clipCount === 0 ? "No build clips anywhere" : `${share(s.clipShare)} of the builds clip somewhere`);
    const section = html.slice(html.indexOf('data-testid="report-spread-stages"'));
    const body = section.slice(0, section.indexOf("</table>"));
    expect(body.match(/<tr/g)!.length - 1).toBe(s.stages.reduce((n, st) => n + st.figures.length, 0));
    for (const st of s.stages) {
      for (const f of st.figures) {
        expect(text(body)).toContain(`${figureText(f.metric, f.p5)} … ${figureText(f.metric, f.p95)}`);
        expect(text(body)).toContain(`${figureText(f.metric, f.min)} … ${figureText(f.metric, f.max)}`);
      }
    }
    for (const p of s.top) expect(page).toContain(`· ${p.param}`);
    // the bring-up table in the same report carries its spread too
    expect(page).toContain("DC over the 200 builds");
  });

  it("names a front end's DC gain per ampere of the photodiode's current, and other stages' as plain ratios", () => {
    const { turbidity } = demo();
    const html = renderToStaticMarkup(
      <DesignReport chainId="c" chain={turbidity} result={analyzeChain(turbidity)} revision={1} version={1} reviewState="draft" reviews={[]} generatedAt="2026-12-04 02:00" paper="a4" />,
    );
    const section = html.slice(html.indexOf('data-testid="report-spread-stages"'));
    const rows = text(section.slice(0, section.indexOf("</table>")));
    expect(rows).toMatch(/tia TIA 800 kΩ DC gain \(V\/A\) −800000/);
    expect(rows).toMatch(/mfb Low-pass 156 Hz DC gain −1 /);
  });
});
