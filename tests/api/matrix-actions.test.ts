/**
 * The authorisation sweep of server actions: every server action in the app (read from the source by
 * tests/support/app-surface.ts) called as every position a person can hold, asserting what it did (a
 * redirect and where to, a refusal it returned, or a plain return) and that what it returned names
 * nothing of another team. An action without a row fails the first test, which says what to add.
 *
 * Next already refuses a server action posted from another origin (it compares Origin with Host), so
 * only who may do what is checked here. Auth.js's signIn/signOut need a live request and are replaced
 * by recorders; what they do is covered by the sign-in tests.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { sessionModule, signInAs } from "./session-mock";
import { mailModule } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);
const authCalls = vi.hoisted(() => ({ signIn: [] as unknown[][], signOut: [] as unknown[][] }));
const { FakeAuthError } = vi.hoisted(() => ({
  FakeAuthError: class AuthError extends Error {
    constructor(public readonly type: string) {
      super(type);
    }
  },
}));
vi.mock("next-auth", () => ({ AuthError: FakeAuthError }));
vi.mock("@/lib/auth", () => ({
  // a wrong password is refused as Auth.js refuses it; anything else goes through
  signIn: vi.fn(async (...args: unknown[]) => {
    authCalls.signIn.push(args);
    if ((args[1] as { password?: string } | undefined)?.password === "not-it") throw new FakeAuthError("CredentialsSignin");
    return "/check-your-mail";
  }),
  signOut: vi.fn(async (...args: unknown[]) => {
    authCalls.signOut.push(args);
  }),
}));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));

import * as authActions from "@/app/(auth)/actions";
import * as invitationActions from "@/app/(auth)/invitation/[token]/actions";
import * as workspaceActions from "@/app/(workspace)/actions";
import * as settingsActions from "@/app/(workspace)/settings/actions";
import { createInvitation } from "@/db/queries/invitations";
import { getUserSettings } from "@/db/queries/settings";
import type { User } from "@/db/schema";
import { appRoutes, importProjectModule, serverActions } from "../support/app-surface";
import { teamWorld, type TeamWorld } from "../support/team-world";
import { useTempDatabase } from "../support/temp-db";

const ROLES = ["owner", "editor", "reviewer", "viewer", "member", "admin", "other", "signedOut"] as const;
type Role = (typeof ROLES)[number];

/**
 * What an action did: "ok" (returned, no error), "refused" (returned an `error` or `fieldErrors`),
 * or "→/path" (redirected there; the query string is left out).
 */
type Outcome = string;

interface ActionCase {
  /** "action FILE NAME", as the first test prints it; a note in parentheses may follow */
  name: string;
  /** the outcome per position, in ROLES order, separated by spaces */
  expect: string;
  /** the action, and a call of it as `me` in the world `w` */
  action: unknown;
  run: (w: TeamWorld, me: User | null) => Promise<unknown>;
  /** an extra check of the effect, after the call */
  after?: (w: TeamWorld, me: User | null) => void;
}

const form = (fields: Record<string, string>) => {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
};
let serial = 0;
const fresh = (label: string) => `${label}.${++serial}.${Date.now().toString(36)}@test.example`;

const EVERYONE = (outcome: string) => ROLES.map(() => outcome).join(" ");

const ACTIONS: ActionCase[] = [
  {
    name: "action app/(auth)/actions.ts signInWithPassword (wrong password)",
    // public: the same refusal for everyone, whoever is signed in
    expect: EVERYONE("refused"),
    action: authActions.signInWithPassword,
    run: (w) => {
      authCalls.signIn.length = 0;
      return authActions.signInWithPassword({}, form({ email: w.owner.email!, password: "not-it" }));
    },
  },
  {
    name: "action app/(auth)/actions.ts signInWithLink",
    expect: EVERYONE("→/check-your-mail"),
    action: authActions.signInWithLink,
    run: () => authActions.signInWithLink({}, form({ email: fresh("link") })),
  },
  {
    name: "action app/(auth)/actions.ts signUp",
    expect: EVERYONE("→/check-your-mail"),
    action: authActions.signUp,
    run: () => authActions.signUp({}, form({ name: "New person", email: fresh("signup"), password: "a long enough passphrase" })),
  },
  {
    name: "action app/(auth)/invitation/[token]/actions.ts acceptInvitationAction (sent to the caller)",
    expect: "→/chains →/chains →/chains →/chains →/chains →/chains →/chains →/sign-in",
    action: invitationActions.acceptInvitationAction,
    run: (w, me) => {
      const { token } = createInvitation(me?.email ?? fresh("nobody"), { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id);
      return invitationActions.acceptInvitationAction(token);
    },
  },
  {
    name: "action app/(auth)/invitation/[token]/actions.ts acceptInvitationAction (sent to someone else)",
    expect: "refused refused refused refused refused refused refused →/sign-in",
    action: invitationActions.acceptInvitationAction,
    run: (w) => {
      const { token } = createInvitation(w.stranger.email!, { chainId: w.chainId, teamId: w.teamId, role: "editor" }, w.owner.id);
      return invitationActions.acceptInvitationAction(token);
    },
  },
  {
    name: "action app/(auth)/invitation/[token]/actions.ts signUpThroughInvitation",
    // the mailed token is the credential: it makes the invited address's account, whoever holds it
    expect: EVERYONE("→/chains"),
    action: invitationActions.signUpThroughInvitation,
    run: (w) => {
      const { token } = createInvitation(fresh("invited"), { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id);
      return invitationActions.signUpThroughInvitation(token, {}, form({ name: "Invited person", password: "a long enough passphrase" }));
    },
  },
  {
    name: "action app/(auth)/invitation/[token]/actions.ts signUpThroughInvitation (address already has an account)",
    expect: EVERYONE("refused"),
    action: invitationActions.signUpThroughInvitation,
    run: (w) => {
      const { token } = createInvitation(w.member.email!, { chainId: w.chainId, teamId: w.teamId, role: "editor" }, w.owner.id);
      return invitationActions.signUpThroughInvitation(token, {}, form({ name: "Taken over", password: "a long enough passphrase" }));
    },
  },
  {
    name: "action app/(workspace)/actions.ts signOutAction",
    expect: EVERYONE("ok"),
    action: workspaceActions.signOutAction,
    run: () => workspaceActions.signOutAction(),
  },
  {
    name: "action app/(workspace)/settings/actions.ts saveNotificationSettings",
    expect: "→/settings →/settings →/settings →/settings →/settings →/settings →/settings →/sign-in",
    action: settingsActions.saveNotificationSettings,
    run: () => settingsActions.saveNotificationSettings(form({ notifyOnReviews: "on" })),
    after: (w, me) => {
      // only the caller's own switches change
      if (me) expect(getUserSettings(me.id)).toEqual({ notifyOnComments: false, notifyOnReviews: true });
      for (const p of [w.owner, w.editor, w.member, w.other].filter((p) => p.id !== me?.id)) expect(getUserSettings(p.id).notifyOnComments, p.email!).toBe(true);
    },
  },
];

/** Name up to the first note in parentheses. */
const actionOf = (row: ActionCase) => row.name.replace(/\s+\([^()]*\)$/, "").trim();

async function outcomeOf(run: () => Promise<unknown>): Promise<{ outcome: Outcome; body: string }> {
  try {
    const value = await run();
    const body = JSON.stringify(value ?? null);
    const refused = !!value && typeof value === "object" && ("error" in value || "fieldErrors" in value);
    return { outcome: refused ? "refused" : "ok", body };
  } catch (err) {
    const digest = (err as { digest?: unknown }).digest;
    if (typeof digest === "string" && digest.startsWith("NEXT_REDIRECT")) {
      const target = digest.split(";")[2] ?? "";
      return { outcome: `→${target.split("?")[0].replace(/^\/(chains|teams)\/[^/]+$/, "/$1")}`, body: target };
    }
    throw err;
  }
}

let tmp: ReturnType<typeof useTempDatabase>;
beforeAll(() => {
  tmp = useTempDatabase();
});
afterAll(() => tmp.cleanup());

describe("authorisation sweep: every server action × every position", () => {
  it("has a row for every server action in the app, and no row for one that is gone", async () => {
    const found = serverActions();
    const covered = new Set(ACTIONS.map(actionOf));
    const missing = found.filter((a) => !covered.has(a.key));
    const message = missing.map((a) => `  ${a.key}: add { name: "${a.key}", expect: "<8 outcomes: ${ROLES.join(" ")}>", action, run } to ACTIONS`).join("\n");
    expect(missing.map((a) => a.key), `server actions without a row in tests/api/matrix-actions.test.ts:\n${message}`).toEqual([]);
    const known = new Set(found.map((a) => a.key));
    expect([...covered].filter((k) => !known.has(k)), "rows naming an action that is gone (or misspelt)").toEqual([]);
    for (const row of ACTIONS) {
      expect(row.expect.split(" "), `${row.name}: one outcome per position (${ROLES.join(" ")})`).toHaveLength(ROLES.length);
      const entry = found.find((a) => a.key === actionOf(row))!;
      expect(row.action, `${row.name} should be export ${entry.name} of ${entry.file}`).toBe((await importProjectModule(entry.file))[entry.name]);
    }
    // the enumeration itself sees the app: the known actions and routes are there
    expect(found.length).toBeGreaterThanOrEqual(7);
    expect(appRoutes().length).toBeGreaterThanOrEqual(40);
  });

  for (const row of ACTIONS) {
    const expected = row.expect.split(" ");
    ROLES.forEach((role, i) => {
      it(`${row.name} as ${role} → ${expected[i]}`, async () => {
        const w = teamWorld();
        const me: User | null = role === "signedOut" ? null : w[role as Exclude<Role, "signedOut">];
        signInAs(me);
        const { outcome, body } = await outcomeOf(() => row.run(w, me));
        expect(outcome, body).toBe(expected[i]);
        expect(body).not.toContain("Secret other chain");
        expect(body).not.toContain(w.stranger.email!);
        row.after?.(w, me);
      });
    });
  }
});
