/** Where to go after signing in when nothing (or nothing safe) was asked for. */
export const DEFAULT_AFTER_SIGN_IN = "/chains";

/**
 * Accept only same-site paths as a post-sign-in destination ("/chains/abc"), never an absolute
 * or protocol-relative URL ("//evil.example"), so the sign-in page cannot be used to bounce
 * someone to another site.
 */
export function safeCallbackPath(raw: unknown): string {
  if (typeof raw !== "string") return DEFAULT_AFTER_SIGN_IN;
  const value = raw.trim();
  if (!value.startsWith("/") || value.startsWith("//") || value.startsWith("/\\") || /[\r\n]/.test(value)) {
    return DEFAULT_AFTER_SIGN_IN;
  }
  if (value.startsWith("/sign-in") || value.startsWith("/sign-up") || value.startsWith("/api/auth")) return DEFAULT_AFTER_SIGN_IN;
  return value;
}
