/**
 * Comparison helpers for the reference tests. Every helper takes the source of the
 * expected value as its last argument; it becomes the assertion message (shown on
 * failure) and is counted, so the suite can report how many sourced checks it makes
 * (set REF_CHECK_LOG=/path to append one line per test file).
 */
import { appendFileSync } from "node:fs";
import type { Cx } from "./cx";
import { afterAll, expect } from "vitest";

let count = 0;
const sources = new Set<string>();

afterAll(() => {
  const log = process.env.REF_CHECK_LOG;
  if (log && count > 0) appendFileSync(log, `${expect.getState().testPath ?? "?"}\t${count}\n`);
});

function note(source: string) {
  count++;
  sources.add(source);
}

export function dB(z: Cx): number {
  return 20 * Math.log10(z.abs());
}

export function phaseDeg(z: Cx): number {
  return (z.arg() * 180) / Math.PI;
}

/** Difference of two angles in degrees, folded into (−180, 180]. */
export function angleDiff(a: number, b: number): number {
  let d = (a - b) % 360;
  if (d <= -180) d += 360;
  if (d > 180) d -= 360;
  return d;
}

/** |actual − expected| ≤ abs + rel·|expected| (one counted check). */
export function near(
  actual: number | null | undefined,
  expected: number,
  tol: { rel?: number; abs?: number },
  source: string,
): void {
  note(source);
  const msg = `${source}: expected ${expected}, got ${actual}`;
  expect(actual, msg).toBeTypeOf("number");
  expect(Number.isFinite(actual), msg).toBe(true);
  const limit = (tol.abs ?? 0) + (tol.rel ?? 0) * Math.abs(expected);
  expect(Math.abs((actual as number) - expected), msg).toBeLessThanOrEqual(limit);
}

/** Phase equality modulo 360° (references.md §0: compare phase modulo 360°). */
export function nearPhase(actual: number | null | undefined, expected: number, tolDeg: number, source: string): void {
  note(source);
  const msg = `${source}: expected phase ${expected}°, got ${actual}°`;
  expect(actual, msg).toBeTypeOf("number");
  expect(Math.abs(angleDiff(actual as number, expected)), msg).toBeLessThanOrEqual(tolDeg);
}

/** A counted non-numeric check (status, warning presence, null-ness). */
export function same<T>(actual: T, expected: T, source: string): void {
  note(source);
  expect(actual, source).toEqual(expected);
}

/** A counted boolean check. */
export function holds(cond: boolean, source: string): void {
  note(source);
  expect(cond, source).toBe(true);
}

export function checkCount(): number {
  return count;
}
