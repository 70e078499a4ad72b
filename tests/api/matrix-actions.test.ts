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
import { createInvitation, findInvitationByToken } from "@/db/queries/invitations";
import { findUserByEmail } from "@/db/queries/users";
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

/**
 * A server action is a public endpoint: React decodes whatever a caller posts into its arguments (any
 * serialisable value, for the form as for a token bound in the browser), not only what the page's own
 * form sends. Each action, called so, must hand back a refusal naming what was wrong (or, for the
 * settings form, go back to its page), never throw (Next's 500), and write nothing.
 */
describe("server actions refuse arguments their own pages never send", () => {
  const NOT_FORMS: unknown[] = [null, undefined, 42, "email=a%40b.example", { email: "x@test.example", get: 1 }, ["x"], new Date(0)];
  const NOT_TOKENS: unknown[] = [null, undefined, 42, { length: 43 }, ["tok"], "", "t".repeat(201)];
  type Call = (w: TeamWorld, bad: unknown) => Promise<unknown>;
  const HOSTILE: Record<string, { calls: Array<[label: string, values: unknown[], call: Call]>; expect: Outcome; after?: (w: TeamWorld) => void }> = {
    "action app/(auth)/actions.ts signInWithPassword": { expect: "refused", calls: [["form", NOT_FORMS, (_w, bad) => authActions.signInWithPassword({}, bad as FormData)]] },
    "action app/(auth)/actions.ts signInWithLink": { expect: "refused", calls: [["form", NOT_FORMS, (_w, bad) => authActions.signInWithLink({}, bad as FormData)]] },
    "action app/(auth)/actions.ts signUp": {
      expect: "refused",
      calls: [
        ["form", NOT_FORMS, (_w, bad) => authActions.signUp({}, bad as FormData)],
        // a file where the name belongs is no name (it used to be taken as "[object File]")
        ["a file as the name", [new File(["x"], "n.txt")], (_w, file) => {
          const f = form({ email: "file-name@test.example", password: "a long enough passphrase" });
          f.set("name", file as File);
          return authActions.signUp({}, f);
        }],
      ],
    },
    "action app/(auth)/invitation/[token]/actions.ts acceptInvitationAction": { expect: "refused", calls: [["token", NOT_TOKENS, (_w, bad) => invitationActions.acceptInvitationAction(bad as string)]] },
    "action app/(auth)/invitation/[token]/actions.ts signUpThroughInvitation": {
      expect: "refused",
      calls: [
        ["token", NOT_TOKENS, (_w, bad) => invitationActions.signUpThroughInvitation(bad as string, {}, form({ name: "Forged", password: "a long enough passphrase" }))],
        ["form", NOT_FORMS, async (w, bad) => {
          const address = fresh("forged-form");
          const { token } = createInvitation(address, { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id);
          const out = await invitationActions.signUpThroughInvitation(token, {}, bad as FormData);
          expect(findUserByEmail(address), "no account made").toBeUndefined();
          expect(findInvitationByToken(token)?.state, "the invitation still open").toBe("open");
          return out;
        }],
      ],
    },
    "action app/(workspace)/settings/actions.ts saveNotificationSettings": {
      expect: "→/settings",
      calls: [["form", NOT_FORMS, (_w, bad) => settingsActions.saveNotificationSettings(bad as FormData)]],
      after: (w) => expect(getUserSettings(w.owner.id)).toEqual({ notifyOnComments: true, notifyOnReviews: true }),
    },
  };
  // signOutAction takes no argument, so there is nothing to forge
  const WITHOUT_ARGUMENTS = new Set(["action app/(workspace)/actions.ts signOutAction"]);

  it("has a case for every server action that takes arguments", () => {
    const keys = serverActions().map((a) => a.key).filter((k) => !WITHOUT_ARGUMENTS.has(k));
    expect(keys.filter((k) => !(k in HOSTILE)), "add the action to HOSTILE in tests/api/matrix-actions.test.ts").toEqual([]);
  });

  for (const [name, row] of Object.entries(HOSTILE)) {
    for (const [label, values, call] of row.calls) {
      it(`${name}: a forged ${label} → ${row.expect}`, async () => {
        const w = teamWorld();
        signInAs(w.owner);
        for (const bad of values) {
          const { outcome, body } = await outcomeOf(() => call(w, bad));
          expect(outcome, `${label} = ${String(bad).slice(0, 40)}: ${body}`).toBe(row.expect);
          if (outcome === "refused") expect(body, "the refusal says what was wrong").toMatch(/"(error|fieldErrors)":/);
        }
        row.after?.(w);
      });
    }
  }
});
