// @vitest-environment jsdom
/** The Standard values section: preview, apply as one edit, undo takes it back. */
import { afterEach, describe, expect, it } from "vitest";
import { act, cleanup, fireEvent, render, screen } from "@testing-library/react";
import { SnapPanel } from "@/components/spread/snap-panel";
import { EditorProvider } from "@/lib/store/editor-context";
import { createEditorStore } from "@/lib/store/editor-store";
import { analyseDraft } from "@/lib/store/live-analysis";
import { findTemplate } from "@/lib/templates";
import { nearestPreferred } from "@/lib/units/eseries";

afterEach(cleanup);

describe("SnapPanel", () => {
  it("previews E96 values with the figures before and after, applies them in one step, and undo restores them", () => {
    const doc = findTemplate("ballast-bridge")!.make();
    // an odd value somewhere, so there is something to snap
    const i = doc.nodes.findIndex((n) => typeof n.params.rf === "number" || typeof n.params.r === "number");
    const key = typeof doc.nodes[i].params.rf === "number" ? "rf" : "r";
    doc.nodes[i].params[key] = 12345;
    const store = createEditorStore({ doc, chainId: "c" });
    act(() => store.getState().actions.setLive(analyseDraft(store.getState().doc, 1)));
    render(
      <EditorProvider store={store}>
        <SnapPanel />
      </EditorProvider>,
    );
    fireEvent.change(screen.getByTestId("snap-series"), { target: { value: "E96" } });
    fireEvent.click(screen.getByTestId("snap-preview"));
    const rows = screen.getByTestId("snap-changes").querySelectorAll("tbody tr");
    expect([...rows].some((r) => r.textContent?.startsWith(`${doc.nodes[i].id}.${key}`))).toBe(true);
    expect(screen.getByTestId("snap-figures").querySelectorAll("tbody tr").length).toBeGreaterThan(0);
    const before = store.getState().doc;
    fireEvent.click(screen.getByTestId("snap-apply"));
    const after = store.getState().doc;
    expect(after.nodes[i].params[key]).toBe(nearestPreferred(12345, "E96"));
    expect(store.getState().past.at(-1)).toBe(before);
    act(() => store.getState().actions.undo());
    expect(store.getState().doc.nodes[i].params[key]).toBe(12345);
  });
});
