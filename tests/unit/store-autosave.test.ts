import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { startAutosave, type SaveFn } from "@/lib/store/autosave";
import { createEditorStore } from "@/lib/store/editor-store";
import { emptyDoc } from "@/lib/store/draft";

beforeEach(() => vi.useFakeTimers());
afterEach(() => vi.useRealTimers());

function setup(save: SaveFn, readOnly = false) {
  const store = createEditorStore({ doc: emptyDoc("A"), chainId: "c1", version: 3, readOnly });
  const auto = startAutosave(store, save, { delayMs: 1000, retryMs: 2000 });
  return { store, auto, a: store.getState().actions };
}

describe("startAutosave", () => {
  it("saves once a second after the last edit, with the version the draft was based on", async () => {
    const save = vi.fn<SaveFn>(async ({ baseVersion }) => ({ version: baseVersion + 1 }));
    const { store, a } = setup(save);
    a.addNode("source");
    await vi.advanceTimersByTimeAsync(500);
    a.addNode("adc");
    await vi.advanceTimersByTimeAsync(900);
    expect(save).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(200);
    expect(save).toHaveBeenCalledTimes(1);
    expect(save.mock.calls[0][0].baseVersion).toBe(3);
    expect(save.mock.calls[0][0].document.nodes).toHaveLength(2);
    expect(store.getState()).toMatchObject({ save: "saved", version: 4 });
  });

  it("saves again, on the new version, what was typed during a save", async () => {
    let release: () => void = () => {};
    const save = vi.fn<SaveFn>(
      ({ baseVersion }) => new Promise((resolve) => (release = () => resolve({ version: baseVersion + 1 }))),
    );
    const { store, a } = setup(save);
    a.addNode("source");
    await vi.advanceTimersByTimeAsync(1000);
    expect(store.getState().save).toBe("saving");
    a.addNode("adc");
    release();
    await vi.advanceTimersByTimeAsync(0);
    expect(store.getState().save).toBe("unsaved");
    await vi.advanceTimersByTimeAsync(1000);
    expect(save).toHaveBeenCalledTimes(2);
    expect(save.mock.calls[1][0].baseVersion).toBe(4);
    release();
    await vi.advanceTimersByTimeAsync(0);
    expect(store.getState()).toMatchObject({ save: "saved", version: 5 });
  });

  it("stops at a conflict and saves nothing more until the user chooses", async () => {
    const save = vi.fn<SaveFn>(async () => {
      throw Object.assign(new Error("stale"), { status: 409, body: { currentVersion: 7 } });
    });
    const { store, a } = setup(save);
    a.addNode("source");
    await vi.advanceTimersByTimeAsync(1000);
    expect(store.getState()).toMatchObject({ save: "conflict", conflict: { serverVersion: 7 } });
    a.addNode("adc");
    await vi.advanceTimersByTimeAsync(10_000);
    expect(save).toHaveBeenCalledTimes(1);
  });

  it("retries a failed save that may pass, and not one the server refused", async () => {
    let n = 0;
    const save = vi.fn<SaveFn>(async ({ baseVersion }) => {
      n++;
      if (n === 1) throw Object.assign(new Error("offline"), { status: 0 });
      return { version: baseVersion + 1 };
    });
    const { store, a } = setup(save);
    a.addNode("source");
    await vi.advanceTimersByTimeAsync(1000);
    expect(store.getState()).toMatchObject({ save: "error", saveError: "offline" });
    await vi.advanceTimersByTimeAsync(2000);
    expect(store.getState().save).toBe("saved");

    const refuse = vi.fn<SaveFn>(async () => {
      throw Object.assign(new Error("forbidden"), { status: 403 });
    });
    const s2 = setup(refuse);
    s2.a.addNode("source");
    await vi.advanceTimersByTimeAsync(30_000);
    expect(refuse).toHaveBeenCalledTimes(1);
    expect(s2.store.getState().save).toBe("error");
  });

  it("saves nothing for a read-only workspace", async () => {
    const save = vi.fn<SaveFn>(async () => ({ version: 9 }));
    const { store, auto } = setup(save, true);
    store.getState().actions.addNode("source");
    await auto.flush();
    await vi.advanceTimersByTimeAsync(5000);
    expect(save).not.toHaveBeenCalled();
  });

  it("saves at once on flush (Ctrl S)", async () => {
    const save = vi.fn<SaveFn>(async ({ baseVersion }) => ({ version: baseVersion + 1 }));
    const { store, auto, a } = setup(save);
    a.addNode("source");
    await auto.flush();
    expect(save).toHaveBeenCalledTimes(1);
    expect(store.getState().save).toBe("saved");
  });
});
