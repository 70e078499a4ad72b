import { describe, expect, it } from "vitest";
import { commandFor, SHELF_KEYS, isTypingTarget } from "@/components/editor/shortcuts";
import { SHELF_ORDER } from "@/lib/store/stage-catalog";

const key = (k: string, mods: Partial<{ ctrl: boolean; meta: boolean; shift: boolean; alt: boolean }> = {}) => ({
  key: k,
  ctrlKey: !!mods.ctrl,
  metaKey: !!mods.meta,
  shiftKey: !!mods.shift,
  altKey: !!mods.alt,
});

describe("commandFor", () => {
  it("maps the editing keys", () => {
    expect(commandFor(key("z", { ctrl: true }))).toEqual({ type: "undo" });
    expect(commandFor(key("Z", { ctrl: true, shift: true }))).toEqual({ type: "redo" });
    expect(commandFor(key("y", { meta: true }))).toEqual({ type: "redo" });
    expect(commandFor(key("d", { ctrl: true }))).toEqual({ type: "duplicate" });
    expect(commandFor(key("v", { ctrl: true }))).toEqual({ type: "paste" });
    expect(commandFor(key("Delete"))).toEqual({ type: "delete" });
    expect(commandFor(key("Backspace"))).toEqual({ type: "delete" });
    expect(commandFor(key("t"))).toEqual({ type: "tidy" });
    expect(commandFor(key("k"))).toEqual({ type: "connect" });
  });

  it("adds shelf kinds by digit, 1 for the first, 9 for the ninth and 0 for the last (the ADC)", () => {
    expect(commandFor(key("1"))).toEqual({ type: "add", kind: "source" });
    expect(commandFor(key("9"))).toEqual({ type: "add", kind: SHELF_ORDER[8] });
    expect(commandFor(key("0"))).toEqual({ type: "add", kind: "adc" });
    expect(SHELF_KEYS.source).toBe("1");
    expect(SHELF_KEYS.adc).toBe("0");
    // no digit is given twice, and the kinds between the ninth and the last have none
    const digits = Object.values(SHELF_KEYS);
    expect(new Set(digits).size).toBe(digits.length);
    for (const k of SHELF_ORDER.slice(9, -1)) expect(SHELF_KEYS[k]).toBeUndefined();
  });

  it("leaves other keys and Alt combinations alone", () => {
    expect(commandFor(key("q"))).toBeNull();
    expect(commandFor(key("z", { alt: true, ctrl: true }))).toBeNull();
    expect(commandFor(key("T", { shift: true }))).toBeNull();
  });
});

describe("isTypingTarget", () => {
  it("recognises fields by tag", () => {
    expect(isTypingTarget({ tagName: "INPUT" } as unknown as EventTarget)).toBe(true);
    expect(isTypingTarget({ tagName: "DIV", isContentEditable: false } as unknown as EventTarget)).toBe(false);
    expect(isTypingTarget(null)).toBe(false);
  });
});
