// @vitest-environment jsdom
import { afterEach, describe, expect, it } from "vitest";
import { act, cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { Inspector } from "@/components/editor/inspector";
import { EditorProvider } from "@/lib/store/editor-context";
import { createEditorStore } from "@/lib/store/editor-store";
import { emptyDoc, type DraftDoc } from "@/lib/store/draft";

afterEach(cleanup);

function setup(doc: Partial<DraftDoc>, select: string, readOnly = false) {
  const store = createEditorStore({ doc: { ...emptyDoc("Test"), ...doc }, readOnly });
  store.getState().actions.select([select]);
  // The models panel also offers the team library (fetched with TanStack Query); here there is no server.
  const queries = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={queries}>
      <EditorProvider store={store}>
        <Inspector />
      </EditorProvider>
    </QueryClientProvider>,
  );
  return store;
}

const integrator = {
  nodes: [{ id: "u1", kind: "lossyIntegrator" as const, params: { r1: 10e3, r2: 100e3, c2: 10e-9 }, part: null, rails: { low: -5, high: 5 } }],
};
const param = (store: ReturnType<typeof setup>, key: string) => store.getState().doc.nodes[0].params[key];
const type = (id: string, text: string) => fireEvent.change(document.getElementById(id)!, { target: { value: text } });

describe("Inspector: engineering notation", () => {
  it("shows stored values in engineering notation with the unit", () => {
    setup(integrator, "u1");
    expect((document.getElementById("f-r1") as HTMLInputElement).value).toBe("10k");
    expect((document.getElementById("f-c2") as HTMLInputElement).value).toBe("10n");
    expect(screen.getByTestId("f-r2-parsed").textContent).toContain("100.0 kΩ");
  });

  it("reads 4k7 as 4.7 kΩ, stores 4700 and names the nearest E24 and E96 values", async () => {
    const store = setup(integrator, "u1");
    type("f-r1", "4k7");
    await waitFor(() => expect(param(store, "r1")).toBeCloseTo(4700, 9));
    expect(screen.getByTestId("f-r1-parsed").textContent).toContain("4.700 kΩ");
    const note = screen.getByTestId("f-r1-note").textContent!;
    expect(note).toContain("E24 ✓"); // 4.7 is an E24 value (IEC 60063)
    expect(note).toContain("E96 4.75k"); // nearest E96 to 4.7 is 4.75 (IEC 60063 E96 table)
  });

  it("reads 2.2u on a capacitor and 1.5 MHz style text with a unit", async () => {
    const store = setup(integrator, "u1");
    type("f-c2", "2.2uF");
    await waitFor(() => expect(param(store, "c2")).toBeCloseTo(2.2e-6, 18));
  });

  it("flags text that does not read, keeps it in the field and leaves the draft alone", async () => {
    const store = setup(integrator, "u1");
    type("f-r2", "4k7x");
    await waitFor(() => expect(screen.getByTestId("f-r2-note").textContent).toMatch(/■/));
    expect((document.getElementById("f-r2") as HTMLInputElement).value).toBe("4k7x");
    expect(document.getElementById("f-r2")!.getAttribute("aria-invalid")).toBe("true");
    expect(param(store, "r2")).toBe(100e3);
  });

  it("refuses a value the shared rules forbid (a negative resistor) with the rule in words", async () => {
    const store = setup(integrator, "u1");
    type("f-r1", "-10k");
    await waitFor(() => expect(screen.getByTestId("f-r1-note").textContent).toMatch(/positive number of ohms/));
    expect(param(store, "r1")).toBe(10e3);
  });

  it("refuses a unit that contradicts the field", async () => {
    const store = setup(integrator, "u1");
    type("f-c2", "10 kΩ");
    await waitFor(() => expect(screen.getByTestId("f-c2-note").textContent).toMatch(/■/));
    expect(param(store, "c2")).toBe(10e-9);
  });

  it("removes a required param left empty and says the stage waits for it", async () => {
    const store = setup(integrator, "u1");
    type("f-r2", "");
    await waitFor(() => expect(param(store, "r2")).toBeUndefined());
    expect(screen.getByTestId("f-r2-note").textContent).toMatch(/needed/);
  });

  it("keeps fLow below fHigh on a source", async () => {
    const store = setup({ nodes: [{ id: "src", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 1000 } }] }, "src");
    type("f-fLow", "5k");
    await waitFor(() => expect(screen.getByTestId("f-fLow-note").textContent).toMatch(/must be above/));
    expect(param(store, "fLow")).toBe(1);
  });

  it("rewrites the field when the draft changes elsewhere (undo)", async () => {
    const store = setup(integrator, "u1");
    type("f-r1", "22k");
    await waitFor(() => expect(param(store, "r1")).toBe(22e3));
    act(() => store.getState().actions.undo());
    await waitFor(() => expect((document.getElementById("f-r1") as HTMLInputElement).value).toBe("10k"));
  });
});

describe("Inspector: rails and model", () => {
  it("requires both rails and stores them only when low is below high", async () => {
    const store = setup({ nodes: [{ id: "u1", kind: "inverting", params: { r1: 1e3, r2: 1e4 }, part: null }] }, "u1");
    type("f-rails-low", "5");
    type("f-rails-high", "-5");
    await waitFor(() => expect(screen.getByTestId("f-rails-high-note").textContent).toMatch(/above the low rail/));
    expect(store.getState().doc.nodes[0].rails).toBeUndefined();
    type("f-rails-low", "-5");
    type("f-rails-high", "5");
    await waitFor(() => expect(store.getState().doc.nodes[0].rails).toEqual({ low: -5, high: 5 }));
  });

  it("chooses a model from the chain's own parts or ideal", () => {
    const store = setup({ ...integrator, parts: { p1: { label: "Generic CMOS", gbw: 1e6 } } }, "u1");
    const select = document.getElementById("f-part") as HTMLSelectElement;
    expect([...select.options].map((o) => o.textContent)).toEqual(["Ideal op-amp", "Generic CMOS (p1)"]);
    fireEvent.change(select, { target: { value: "p1" } });
    expect(store.getState().doc.nodes[0].part).toBe("p1");
  });

  it("edits a model's figures in engineering notation in the models panel", async () => {
    const store = setup({ ...integrator, parts: { p1: { label: "Generic CMOS", gbw: 1e6 } } }, "u1");
    fireEvent.click(screen.getByRole("button", { name: "Models…" }));
    type("part-p1-slewRate", "0.5 V/µs");
    await waitFor(() => expect(store.getState().doc.parts.p1.slewRate).toBeCloseTo(5e5, 6));
    type("part-p1-gbw", "0");
    await waitFor(() => expect(screen.getByTestId("part-p1-gbw-note").textContent).toMatch(/■/));
    expect(store.getState().doc.parts.p1.gbw).toBe(1e6);
  });
});

describe("Inspector: read-only", () => {
  it("disables every field and changes nothing", () => {
    const store = setup(integrator, "u1", true);
    const input = document.getElementById("f-r1") as HTMLInputElement;
    expect(input.closest("fieldset")!.disabled).toBe(true);
    type("f-r1", "1k");
    expect(param(store, "r1")).toBe(10e3);
  });
});
