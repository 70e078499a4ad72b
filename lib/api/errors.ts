/** JSON error bodies every route handler answers with. */

export interface FieldError {
  path: string;
  message: string;
}

/** An expected refusal: becomes `{ error, ...extra }` (or `{ errors }` for 400s) with its status. */
export class ApiError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

/** 400 with the offending fields named, as `{ errors: [{ path, message }] }`. */
export class ValidationError extends ApiError {
  constructor(public readonly errors: FieldError[]) {
    super(400, errors.map((e) => `${e.path || "body"}: ${e.message}`).join("; "), { errors });
    this.name = "ValidationError";
  }
}

export function jsonError(status: number, message: string, extra: Record<string, unknown> = {}): Response {
  return Response.json({ error: message, ...extra }, { status });
}

/** Turn zod-style issue paths (["nodes", 1, "params"]) into `nodes[1].params`. */
export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let out = "";
  for (const part of path) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out ? `.${String(part)}` : String(part);
  }
  return out;
}
