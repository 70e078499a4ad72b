/**
 * A defensive copy of untrusted input into plain JSON-shaped data before validation. It refuses what JSON
 * cannot hold (cycles, functions, class instances, bigints), bounds depth and size, and copies keys as own
 * data properties so a `__proto__` key stays an ordinary (and then refused) field instead of replacing a
 * prototype. Getters run once here; later checks see a stable snapshot.
 */

export type PlainJsonResult = { ok: true; value: unknown } | { ok: false; path: (string | number)[]; message: string };

const MAX_DEPTH = 64;
const MAX_VALUES = 500_000;

class Refusal {
  constructor(
    readonly path: (string | number)[],
    readonly message: string,
  ) {}
}

export function toPlainJson(input: unknown): PlainJsonResult {
  let count = 0;
  const onPath = new Set<object>();

  const copy = (v: unknown, path: (string | number)[]): unknown => {
    if (++count > MAX_VALUES) throw new Refusal([], `is too large (over ${MAX_VALUES} values)`);
    if (typeof v === "number") return v === 0 ? 0 : v; // -0 becomes 0, as it does through JSON
    if (v === null || typeof v === "string" || typeof v === "boolean" || v === undefined) return v;
    if (typeof v !== "object") throw new Refusal(path, `is not JSON data (a ${typeof v})`);
    if (path.length > MAX_DEPTH) throw new Refusal(path, `is nested too deeply (over ${MAX_DEPTH} levels)`);
    if (onPath.has(v)) throw new Refusal(path, "refers back to itself (a cycle); a document must be a tree of JSON data");
    onPath.add(v);
    try {
      if (Array.isArray(v)) {
        const out: unknown[] = [];
        for (let i = 0; i < v.length; i++) out.push(copy(v[i], [...path, i]));
        return out;
      }
      const proto = Object.getPrototypeOf(v);
      if (proto !== Object.prototype && proto !== null) {
        const name = typeof proto?.constructor?.name === "string" ? proto.constructor.name : "object";
        throw new Refusal(path, `is not JSON data (a ${name})`);
      }
      const out: Record<string, unknown> = {};
      for (const key of Object.keys(v)) {
        const value = copy((v as Record<string, unknown>)[key], [...path, key]);
        if (value === undefined) continue; // as JSON.stringify does
        Object.defineProperty(out, key, { value, enumerable: true, writable: true, configurable: true });
      }
      return out;
    } finally {
      onPath.delete(v);
    }
  };

  try {
    return { ok: true, value: copy(input, []) };
  } catch (e) {
    if (e instanceof Refusal) return { ok: false, path: e.path, message: e.message };
    return { ok: false, path: [], message: `could not be read (${errorText(e)})` };
  }
}

/** The message of anything thrown, without trusting it (a hostile getter may throw again). */
export function errorText(e: unknown): string {
  try {
    return e instanceof Error ? String(e.message) : "unknown failure";
  } catch {
    return "unknown failure";
  }
}
