"use client";
/**
 * Browser calls to the team routes. A refusal becomes ApiFailure (the workspace client's error type)
 * carrying the route's JSON body, so forms can show the field errors the server named.
 */
import { ApiFailure } from "@/lib/api/client/chains";

export { ApiFailure };

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
