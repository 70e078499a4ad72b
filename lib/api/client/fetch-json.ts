/**
 * The one browser-side JSON fetcher for our API routes. A refusal becomes ApiFailure carrying the
 * route's JSON body, so callers can show the field errors the server named, tell a stale save (409,
 * with `currentVersion`) from a lost session, and read a network failure as status 0.
 */

export class ApiFailure extends Error {
  constructor(
    readonly status: number,
    readonly body: { error?: string; errors?: { path: string; message: string }[]; currentVersion?: number; [k: string]: unknown },
  ) {
    super(body.error ?? body.errors?.map((e) => `${e.path}: ${e.message}`).join("; ") ?? `request failed (${status})`);
    this.name = "ApiFailure";
  }
  get isConflict() {
    return this.status === 409;
  }
}

/** Call a route; `body` is sent as JSON. Resolves to the parsed answer, throws ApiFailure otherwise. */
export async function fetchJson<T>(url: string, init?: { method?: string; body?: unknown }): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, {
      method: init?.method ?? "GET",
      headers: init?.body === undefined ? {} : { "content-type": "application/json" },
      body: init?.body === undefined ? undefined : JSON.stringify(init.body),
      credentials: "same-origin",
    });
  } catch (e) {
    throw new ApiFailure(0, { error: `the server could not be reached (${e instanceof Error ? e.message : String(e)})` });
  }
  const text = await res.text();
  let body: unknown = {};
  try {
    body = text ? JSON.parse(text) : {};
  } catch {
    body = { error: `the server answered ${res.status} without JSON` };
  }
  if (!res.ok) throw new ApiFailure(res.status, body as ApiFailure["body"]);
  return body as T;
}

/** The message to show for any failure of a call. */
export function problemText(e: unknown): string {
  if (e instanceof ApiFailure) return e.body.errors?.map((x) => (x.path ? `${x.path}: ${x.message}` : x.message)).join("; ") || e.message;
  return e instanceof Error ? e.message : String(e);
}
