import "server-only";
import { AccessError } from "@/lib/auth/permissions";
import { ApiError, jsonError, ValidationError } from "./errors";

type Handler<C> = (request: Request, context: C) => Promise<Response>;

/**
 * Wrap a route handler so that every expected refusal becomes its JSON answer (400 with field
 * paths, 401, 403, 404, 409, 413) and anything unexpected a logged 500 without internals.
 */
export function apiRoute<C = unknown>(handler: Handler<C>): Handler<C> {
  return async (request, context) => {
    try {
      return await handler(request, context);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export function errorResponse(err: unknown): Response {
  if (err instanceof ValidationError) return Response.json({ errors: err.errors }, { status: 400 });
  if (err instanceof ApiError) return jsonError(err.status, err.message, err.extra);
  if (err instanceof AccessError) return jsonError(err.status, err.message);
  console.error("[api] unexpected error", err);
  return jsonError(500, "Something went wrong on the server; the request was not carried out.");
}
