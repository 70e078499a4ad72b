import { z } from "zod";

/**
 * Runs in the browser before the app's own code. zod compiles object parsers with `new Function`
 * unless told not to; the content security policy (proxy.ts) forbids eval, so the probe zod makes
 * would be reported as a violation on every page that validates. The interpreted parsers are fast
 * enough for a form or a chain document; the server keeps the compiled ones.
 */
z.config({ jitless: true });
