import "server-only";
import { AccessError } from "@/lib/auth/permissions";
import { sameOriginProblem, STATE_CHANGING_METHODS } from "@/lib/security/headers";
import { ApiError, jsonError, ValidationError } from "./errors";

type Handler<C> = (request: Request, context: C) => Promise<Response>;

/**
 * Wrap a route handler so that every expected refusal becomes its JSON answer (400 with field
 * paths, 401, 403, 404, 409, 413) and anything unexpected a logged 500 without internals.
 * A state-changing request (POST, PUT, PATCH, DELETE) sent by another site's page is refused
 * with 403 before the handler runs (see `sameOriginProblem`).
 */
export function apiRoute<C = unknown>(handler: Handler<C>): Handler<C> {
  return async (request, context) => {
    const crossSite = crossSiteRefusal(request);
    if (crossSite) return crossSite;
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

/**
 * 403 for a state-changing request that another site's page sent, else null. The one same-origin
 * check: `apiRoute` runs it for every handler, and the Auth.js route (which has no apiRoute) too.
 */
export function crossSiteRefusal(request: Request): Response | null {
  if (!STATE_CHANGING_METHODS.has(request.method.toUpperCase())) return null;
  const problem = sameOriginProblem(request.headers);
  if (!problem) return null;
  return jsonError(403, `Refused: this request came from another site (${problem}).`);
}
