// @vitest-environment jsdom
/**
 * The hand-off tables as they render: every spread figure on the page is the one lib/handoff handed over
 * (which the other hand-off tests hold against the engine), and the page says how it was made.
 */
import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { BringUpTable, rangeDigits, rangeText } from "@/components/outputs/bring-up-table";
import { analyzeChain } from "@/lib/engine";
import { buildBringUpSheet, defaultTestFrequencies, withSpread } from "@/lib/handoff";
import { demo } from "./handoff-support";

afterEach(cleanup);

const range = (r: { min: number; max: number } | null) => (r ? rangeText(r, "") : null);

describe("BringUpTable", () => {
  it("shows each point's DC over the builds and the AC range per frequency, and states builds, seed and tolerances", () => {
    const { hull } = demo();
    const sheet = withSpread(hull, buildBringUpSheet(hull, analyzeChain(hull), defaultTestFrequencies(hull)), 40, 3);
    render(<BringUpTable sheet={sheet} />);
    const rows = screen.getByTestId("bring-up-table").querySelectorAll("tbody tr");
    expect(rows).toHaveLength(sheet.points.length);
    const heads = [...screen.getByTestId("bring-up-table").querySelectorAll("thead th")].map((h) => h.textContent);
    expect(heads).toContain("DC over the 40 builds");
    sheet.spread!.points.forEach((s, j) => {
      const cells = rows[j].querySelectorAll("td");
      expect(rows[j].querySelector('[data-testid="spread-dc"]')!.textContent).toBe(range(s.dcInterval) ?? "unbounded");
      s.amplitude.forEach((a, k) => {
        // the AC cells follow the five fixed columns; the spread's range is the cell's second line
        const cell = cells[5 + k];
        expect(cell.querySelector("span")!.textContent).toBe(range(a) ?? "—");
      });
    });
    const note = screen.getByTestId("bring-up-spread-note").textContent!;
    expect(note).toContain("40 builds (seed 3)");
    expect(note).toContain(`resistors ±${Number((hull.tolerances.resistor * 100).toPrecision(3))} %`);
    expect(note).toContain(`${sheet.spread!.parts} parts vary`);
    // wherever the builds moved a level, its two printed ends differ
    for (const s of sheet.spread!.points) {
      for (const r of [s.dcInterval, ...s.amplitude]) {
        if (r && r.max > r.min) expect(new Set(rangeText(r, "").split(" … ")).size).toBe(2);
      }
    }
  });

  it("prints narrow ranges with more digits, up to seven", () => {
    expect(rangeDigits({ min: 0.382, max: 0.399 })).toBe(4);
    expect(rangeText({ min: 2.49985, max: 2.50015 }, "")).toBe("2.49985 V … 2.50015 V");
    expect(rangeDigits({ min: 1, max: 1 + 1e-12 })).toBe(7);
    expect(rangeDigits({ min: 0, max: 0 })).toBe(4);
  });

  it("without a spread the table keeps its four DC columns and says nothing of builds", () => {
    const { turbidity } = demo();
    render(<BringUpTable sheet={buildBringUpSheet(turbidity, analyzeChain(turbidity), [10])} />);
    expect(screen.getByTestId("bring-up-table").querySelectorAll("thead th")).toHaveLength(5);
    expect(screen.queryByTestId("bring-up-spread-note")).toBeNull();
  });
});
