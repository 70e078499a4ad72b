import { z } from "zod";

/**
 * Server actions are public endpoints: React decodes whatever a caller posts into their arguments,
 * not only what our own forms and bound values send. These helpers read those arguments without
 * trusting their types, so a forged call gets a refusal that names what was wrong instead of a
 * TypeError (which Next answers with a 500).
 */

/** The refusal when an action meant for a form is called with something else. */
export const NOT_A_FORM = "This request did not carry the form's fields. Send it from the page's form.";

/**
 * The named text fields of a submitted form, or null when `form` is not a form. A missing field, or a
 * file where text was expected, reads as "" so the schema then names it.
 */
export function formFields<K extends string>(form: unknown, names: readonly K[]): Record<K, string> | null {
  if (!(form instanceof FormData)) return null;
  const out = {} as Record<K, string>;
  for (const n of names) {
    const v = form.get(n);
    out[n] = typeof v === "string" ? v : "";
  }
  return out;
}

/** An invitation link's token as it arrives in an action's bound argument (ours are 43 characters). */
export const invitationTokenSchema = z.string("the invitation link's token").min(1, "the invitation link's token").max(200, "not an invitation link's token");
