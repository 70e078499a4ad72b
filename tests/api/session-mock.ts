import { vi } from "vitest";
import type { User } from "@/db/schema";

/**
 * Route tests call the exported handlers directly. The only piece of a live request they need
 * is "who is signed in", which lib/auth/session.ts answers; tests replace it with this switch.
 * Use with: vi.mock("@/lib/auth/session", () => sessionModule);
 */
let current: User | null = null;

export const sessionModule = {
  getCurrentUser: vi.fn(async () => current),
};

export function signInAs(user: User | null): void {
  current = user;
}

/** A JSON request to a route handler. */
export function jsonRequest(method: string, url: string, body?: unknown, raw?: string): Request {
  const text = raw ?? (body === undefined ? undefined : JSON.stringify(body));
  return new Request(`http://localhost${url}`, {
    method,
    headers: text === undefined ? {} : { "content-type": "application/json" },
    body: text,
  });
}

/** The context object Next passes to dynamic route handlers. */
export function idContext(id: string): { params: Promise<{ id: string }> } {
  return { params: Promise.resolve({ id }) };
}

/** The context object Next passes to a route handler with several dynamic segments, e.g. { id, userId }. */
export function paramsContext<P extends Record<string, string>>(params: P): { params: Promise<P> } {
  return { params: Promise.resolve(params) };
}
