// @vitest-environment jsdom
import { afterEach, describe, expect, it } from "vitest";
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { ChecksPanel } from "@/components/checks/checks-panel";
import { HeadroomTable } from "@/components/checks/headroom-table";
import { warningWords, SEVERITY_LOOK } from "@/components/checks/warning-words";
import { EditorProvider } from "@/lib/store/editor-context";
import { createEditorStore } from "@/lib/store/editor-store";
import { analyseDraft } from "@/lib/store/live-analysis";
import { findTemplate } from "@/lib/templates";

afterEach(cleanup);

/** The bridge example with its in-amp's gain raised so far that it, the stage after it and the converter clip. */
function clippingStore() {
  const doc = findTemplate("ballast-bridge")!.make();
  doc.nodes[1].params.rf = 1e6; // gain 1 + 2·1 MΩ/374 Ω ≈ 5350 on the bridge's 10 mV ± 3 mV at DC
  const store = createEditorStore({ doc, chainId: "c" });
  store.getState().actions.setLive(analyseDraft(store.getState().doc, 1));
  return store;
}

function renderWith(ui: React.ReactNode, store = clippingStore()) {
  render(<EditorProvider store={store}>{ui}</EditorProvider>);
  return store;
}

describe("warningWords", () => {
  it("names every warning code the format lists and ranks faults before cautions and watches", () => {
    for (const code of ["rail-clip", "rail-tight", "no-dc-path", "input-range", "slew", "adc-range", "alias", "nyquist", "safety"]) {
      expect(warningWords(code).title).not.toBe(code);
    }
    expect(SEVERITY_LOOK[warningWords("rail-clip").severity].rank).toBeLessThan(SEVERITY_LOOK[warningWords("alias").severity].rank);
    expect(warningWords("something-new")).toEqual({ title: "something-new", severity: "note" });
    // the sensor front ends' checks are named too, and an unstable loop is not a mere note
    for (const code of ["inamp-common-mode", "tia-stability", "tia-bandwidth", "charge-corner"]) expect(warningWords(code).title).not.toBe(code);
    expect(SEVERITY_LOOK[warningWords("tia-stability").severity].rank).toBeLessThan(SEVERITY_LOOK[warningWords("noise-band").severity].rank);
  });
});

describe("ChecksPanel", () => {
  it("lists the engine's findings with their causes, faults first, and selects a finding's node", () => {
    const store = renderWith(<ChecksPanel />);
    const items = within(screen.getByTestId("findings")).getAllByRole("button");
    const codes = items.map((b) => b.getAttribute("data-code"));
    expect(codes[0]).toBe("rail-clip");
    expect(codes.indexOf("alias")).toBeGreaterThan(codes.lastIndexOf("rail-clip"));
    const clip = items.find((b) => b.getAttribute("data-node") === "u1" && b.getAttribute("data-code") === "rail-clip")!;
    expect(clip.textContent).toMatch(/Fault/);
    expect(clip.textContent).toMatch(/source's DC/);
    fireEvent.click(clip);
    expect(store.getState().selected).toEqual(["u1"]);
  });

  it("says why parts of a half-drawn chain wait", () => {
    const doc = findTemplate("ballast-bridge")!.make();
    delete doc.nodes[3].params.c;
    const store = createEditorStore({ doc, chainId: "c" });
    act(() => store.getState().actions.setLive(analyseDraft(doc, 1)));
    renderWith(<ChecksPanel />, store);
    expect(screen.getByTestId("waiting").textContent).toMatch(/rc1/);
  });
});

describe("HeadroomTable", () => {
  it("lists every analysed op-amp stage and converter and sorts by a column", () => {
    const store = renderWith(<HeadroomTable />);
    const rows = () => screen.getAllByRole("row").slice(1).map((r) => r.getAttribute("data-row"));
    expect(rows()).toEqual(["u1", "u2", "adc1"]);
    const margin = screen.getByRole("button", { name: "Margin" });
    fireEvent.click(margin); // ascending: the least margin (most negative) first
    // margin = min(peak.min − low, high − peak.max) from the live figures themselves
    const live = store.getState().live!;
    const range = (id: string) => (id === "adc1" ? { low: -2.5, high: 2.5 } : live.stageById[id].usable!);
    const peak = (id: string) => (id === "adc1" ? (live.adcById.adc1 as unknown as { peakIn: { min: number; max: number } }).peakIn : live.stageById[id].peakOut!);
    const m = (id: string) => Math.min(peak(id).min - range(id).low, range(id).high - peak(id).max);
    const sorted = rows() as string[];
    expect([...sorted].sort((a, b) => m(a) - m(b))).toEqual(sorted);
    expect(sorted).toEqual(["adc1", "u2", "u1"]); // the converter, driven about 120 V past its ±2.5 V range, first
    expect(screen.getByRole("columnheader", { name: "Margin" }).getAttribute("aria-sort")).toBe("ascending");
    fireEvent.click(margin);
    expect(rows()).toEqual([...sorted].reverse());
    fireEvent.click(screen.getAllByRole("row")[1]);
    expect(store.getState().selected).toEqual([sorted[2]]);
  });
});
