// @vitest-environment jsdom
/**
 * The hand-off tables as they render: every spread figure on the page is the one lib/handoff handed over
 * (which the other hand-off tests hold against the engine), and the page says how it was made.
 */
import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { BringUpTable } from "@/components/outputs/bring-up-table";
import { analyzeChain } from "@/lib/engine";
import { buildBringUpSheet, defaultTestFrequencies, withSpread } from "@/lib/handoff";
import { formatQuantity } from "@/lib/units";
import { demo } from "./handoff-support";

afterEach(cleanup);

const range = (r: { min: number; max: number } | null) => (r ? `${formatQuantity(r.min, "volt", 4)} … ${formatQuantity(r.max, "volt", 4)}` : null);

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
  });

  it("without a spread the table keeps its four DC columns and says nothing of builds", () => {
    const { turbidity } = demo();
    render(<BringUpTable sheet={buildBringUpSheet(turbidity, analyzeChain(turbidity), [10])} />);
    expect(screen.getByTestId("bring-up-table").querySelectorAll("thead th")).toHaveLength(5);
    expect(screen.queryByTestId("bring-up-spread-note")).toBeNull();
  });
});
