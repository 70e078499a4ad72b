import type { z } from "zod";
import { ApiError, formatPath, ValidationError, type FieldError } from "./errors";

/** Largest JSON body a route accepts unless it says otherwise (a big chain is ~100 kB). */
export const DEFAULT_BODY_LIMIT = 1024 * 1024;

export type Validated<T> = { ok: true; data: T } | { ok: false; errors: FieldError[] };

/** The one validation step for every write: zod safeParse into `{ ok, data } | { ok, errors }`. */
export function validate<S extends z.ZodType>(schema: S, input: unknown): Validated<z.output<S>> {
  const result = schema.safeParse(input);
  if (result.success) return { ok: true, data: result.data };
  return {
    ok: false,
    errors: result.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })),
  };
}

/**
 * Read a request body as JSON within a size limit. Too large → 413; not JSON → 400. The limit
 * is checked on the bytes actually read, not only on Content-Length, which a client may omit.
 */
export async function readJsonBody(request: Request, limit = DEFAULT_BODY_LIMIT): Promise<unknown> {
  const declared = Number(request.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > limit) {
    throw new ApiError(413, `Request body is larger than ${limit} bytes.`, { limit });
  }
  const body = request.body;
  if (!body) throw new ValidationError([{ path: "", message: "a JSON body is required" }]);
  const reader = body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel();
      throw new ApiError(413, `Request body is larger than ${limit} bytes.`, { limit });
    }
    chunks.push(value);
  }
  const text = Buffer.concat(chunks).toString("utf8");
  if (!text.trim()) throw new ValidationError([{ path: "", message: "a JSON body is required" }]);
  try {
    return JSON.parse(text);
  } catch {
    throw new ValidationError([{ path: "", message: "the body is not valid JSON" }]);
  }
}

/** Read and validate a JSON body in one go; throws ValidationError / ApiError(413). */
export async function parseBody<S extends z.ZodType>(request: Request, schema: S, limit?: number): Promise<z.output<S>> {
  const raw = await readJsonBody(request, limit);
  const result = validate(schema, raw);
  if (!result.ok) throw new ValidationError(result.errors);
  return result.data;
}
