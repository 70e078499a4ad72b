// @vitest-environment jsdom
import { afterEach, describe, expect, it } from "vitest";
import { cleanup, render, screen } from "@testing-library/react";
import { RailSpan } from "@/components/editor/rail-span";
import { railSpanGeometry } from "@/components/editor/rail-span-geometry";

afterEach(cleanup);

describe("railSpanGeometry", () => {
  it("places usable band, DC and peak as fractions of the rail-to-rail width", () => {
    // Rails ±5 V (width 10 V). usable ±4.95 → 0.005..0.995; DC [−2.08, −1.88] → 0.292..0.312.
    const g = railSpanGeometry({
      rails: { low: -5, high: 5 },
      usable: { low: -4.95, high: 4.95 },
      dcOut: { min: -2.08, max: -1.88 },
      peakOut: { min: -2.575, max: -1.385 },
    })!;
    expect(g.usable!.from).toBeCloseTo(0.005, 12);
    expect(g.usable!.to).toBeCloseTo(0.995, 12);
    expect(g.dc!.from).toBeCloseTo(0.292, 12);
    expect(g.dc!.to).toBeCloseTo(0.312, 12);
    expect(g.peak!.from).toBeCloseTo(0.2425, 12);
    expect(g.zero).toBeCloseTo(0.5, 12);
    // spare at the tighter (low) end: (−2.575 − −4.95) / 9.9
    expect(g.spare).toBeCloseTo((4.95 - 2.575) / 9.9, 12);
  });

  it("pins an interval past a rail to the end and says so", () => {
    const g = railSpanGeometry({ rails: { low: 0, high: 5 }, dcOut: { min: 4, max: 9 }, peakOut: { min: 3, max: 10 } })!;
    expect(g.dc).toMatchObject({ from: 0.8, to: 1, pastHigh: true, pastLow: false });
    expect(g.peak!.pastHigh).toBe(true);
    expect(g.zero).toBeNull();
    expect(g.spare!).toBeLessThan(0);
  });

  it("marks an unbounded DC interval and refuses rails that are not a span", () => {
    expect(railSpanGeometry({ rails: { low: -5, high: 5 }, dcOut: null })!.unbounded).toBe(true);
    expect(railSpanGeometry({ rails: { low: 5, high: -5 } })).toBeNull();
    expect(railSpanGeometry({ rails: null })).toBeNull();
  });
});

describe("RailSpan", () => {
  it("draws each mark where the geometry puts it and names the values for assistive tech", () => {
    render(
      <RailSpan
        rails={{ low: -5, high: 5 }}
        usable={{ low: -4.95, high: 4.95 }}
        dcOut={{ min: -2.08, max: -1.88 }}
        peakOut={{ min: -2.575, max: -1.385 }}
        status="ok"
      />,
    );
    const span = screen.getByTestId("rail-span");
    expect(span.getAttribute("data-status")).toBe("ok");
    const dc = span.querySelector('[data-part="dc"]') as HTMLElement;
    expect(parseFloat(dc.style.left)).toBeCloseTo(29.2, 6);
    expect(parseFloat(dc.style.width)).toBeCloseTo(2, 6);
    expect(span.querySelector('[data-part="past-high"]')).toBeNull();
    const label = span.getAttribute("aria-label")!;
    expect(label).toContain("rails -5.00 V to 5.00 V");
    expect(label).toContain("DC -2.08 V to -1.88 V");
    // status as a word, not only a colour
    expect(span.textContent).toMatch(/Within rails/);
  });

  it("shows a clipping stage with the word, the shape and an arrow past the rail", () => {
    render(<RailSpan rails={{ low: -5, high: 5 }} dcOut={{ min: 6, max: 7 }} peakOut={{ min: 5.5, max: 7.5 }} status="clip" />);
    const span = screen.getByTestId("rail-span");
    expect(span.querySelector('[data-part="past-high"]')).not.toBeNull();
    expect(span.querySelector('[data-part="past-low"]')).toBeNull();
    expect(span.textContent).toMatch(/■/);
    expect(span.textContent).toMatch(/Hits a rail/);
  });

  it("shows an unbounded DC output (no DC path) across the whole bar with arrows both ways", () => {
    render(<RailSpan rails={{ low: -5, high: 5 }} dcOut={null} peakOut={null} status="clip" />);
    const span = screen.getByTestId("rail-span");
    expect(span.querySelector('[data-part="unbounded"]')).not.toBeNull();
    expect(span.querySelector('[data-part="past-low"]')).not.toBeNull();
    expect(span.getAttribute("aria-label")).toContain("DC unbounded");
  });

  it("says the rails are not set rather than drawing a bar", () => {
    render(<RailSpan rails={undefined} />);
    expect(screen.getByTestId("rail-span").textContent).toBe("rails not set");
  });
});
