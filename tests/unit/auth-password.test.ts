import bcrypt from "bcryptjs";
import { describe, expect, it, vi } from "vitest";
import { authErrorMessage } from "@/lib/auth/error-messages";
import { accountNameSchema, BCRYPT_COST, hashPassword, newPasswordSchema, PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH, verifyPassword } from "@/lib/auth/password";
import { safeCallbackPath } from "@/lib/auth/redirects";

describe("hashPassword / verifyPassword", () => {
  it("accepts the right password and refuses a wrong one", async () => {
    const hash = await hashPassword("correct horse battery");
    expect(hash).toMatch(/^\$2[aby]\$11\$/);
    expect(await verifyPassword("correct horse battery", hash)).toBe(true);
    expect(await verifyPassword("correct horse batterz", hash)).toBe(false);
  });

  it("with no stored hash still runs a full bcrypt comparison, and says no", async () => {
    const spy = vi.spyOn(bcrypt, "compare");
    expect(await verifyPassword("anything at all", null)).toBe(false);
    expect(await verifyPassword("anything at all", undefined)).toBe(false);
    expect(spy).toHaveBeenCalledTimes(2);
    // the dummy hash has the same cost as real ones, so the refusal takes as long
    const dummy = spy.mock.calls[0][1] as string;
    expect(bcrypt.getRounds(dummy)).toBe(BCRYPT_COST);
    spy.mockRestore();
  });
});

describe("the new-account fields both sign-up forms share", () => {
  it("holds a password to the length rule at both ends, with the limit in the message", () => {
    expect(newPasswordSchema.safeParse("x".repeat(PASSWORD_MIN_LENGTH)).success).toBe(true);
    expect(newPasswordSchema.safeParse("x".repeat(PASSWORD_MAX_LENGTH)).success).toBe(true);
    const short = newPasswordSchema.safeParse("x".repeat(PASSWORD_MIN_LENGTH - 1));
    expect(short.success ? null : short.error.issues[0].message).toBe(`at least ${PASSWORD_MIN_LENGTH} characters`);
    const long = newPasswordSchema.safeParse("x".repeat(PASSWORD_MAX_LENGTH + 1));
    expect(long.success ? null : long.error.issues[0].message).toBe(`at most ${PASSWORD_MAX_LENGTH} characters`);
  });

  it("trims a name and refuses one that is only spaces", () => {
    expect(accountNameSchema.parse("  Ada Keel  ")).toBe("Ada Keel");
    const blank = accountNameSchema.safeParse("   ");
    expect(blank.success ? null : blank.error.issues[0].message).toBe("enter your name");
  });
});

describe("safeCallbackPath", () => {
  it.each([
    ["/chains", "/chains"],
    ["/chains/abc?x=1", "/chains/abc?x=1"],
    ["//evil.example/path", "/chains"],
    ["/\\evil.example", "/chains"],
    ["https://evil.example/", "/chains"],
    ["javascript:alert(1)", "/chains"],
    ["/sign-in", "/chains"],
    ["/api/auth/signout", "/chains"],
    [undefined, "/chains"],
    [["/a", "/b"], "/chains"],
  ])("%j → %s", (input, expected) => {
    expect(safeCallbackPath(input)).toBe(expected);
  });
});

describe("authErrorMessage", () => {
  it("explains a used or expired link plainly", () => {
    const m = authErrorMessage("Verification");
    expect(m.title).toMatch(/no longer works/);
    expect(m.body).toMatch(/used already or has expired/);
  });

  it("uses one wording for wrong passwords whoever the address belongs to", () => {
    expect(authErrorMessage("CredentialsSignin").body).toMatch(/do not match an account/);
  });

  it("falls back to a general message for codes it does not know", () => {
    expect(authErrorMessage("SomethingNew").title).toBe("Sign-in did not work");
  });
});
