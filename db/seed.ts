import "server-only";
import { count, eq } from "drizzle-orm";
import { pathToFileURL } from "node:url";
import { analyzeChain } from "@/lib/engine";
import { validateChain } from "@/lib/chain/schema";
import { hashPassword } from "@/lib/auth/password";
import { closeDb, getDb, type Db } from "./connection";
import { insertChain } from "./queries/chains";
import { ensurePersonalTeam } from "./queries/users";
import { chainMembers, chains, parts, teamMembers, teams, users, userSettings, type WorstStatus } from "./schema";
import { ballastPressure, hullVibration, turbidityPhotodiode } from "./seed-data/chains";
import { DEMO_PARTS } from "./seed-data/parts";
import { DEMO_PASSWORD, DEMO_PEOPLE, DEMO_TEAM_NAME } from "./seed-data/people";

/** True when the database holds no users, teams or chains: the only state the seed writes into. */
export function isEmpty(db: Db): boolean {
  const [u] = db.select({ n: count() }).from(users).all();
  const [t] = db.select({ n: count() }).from(teams).all();
  const [c] = db.select({ n: count() }).from(chains).all();
  return u.n === 0 && t.n === 0 && c.n === 0;
}

/** The worst headroom status over every stage and ADC of an analysed chain, for the chain list. */
function worstStatusOf(document: unknown): WorstStatus | null {
  const valid = validateChain(document);
  if (!valid.ok) {
    throw new Error(`demo chain is not valid: ${valid.errors.map((e) => `${e.path}: ${e.message}`).join("; ")}`);
  }
  try {
    const result = analyzeChain(valid.chain);
    const order: WorstStatus[] = ["ok", "tight", "clip"];
    let worst = 0;
    for (const path of result.paths) {
      for (const s of [...path.stages.map((st) => st.status), path.adc?.status]) {
        if (s) worst = Math.max(worst, order.indexOf(s));
      }
    }
    return order[worst];
  } catch (err) {
    // The list can live without the summary; the editor recomputes it on opening.
    console.warn("[seed] analysis failed, worst status left empty:", err instanceof Error ? err.message : err);
    return null;
  }
}

/**
 * Fill an empty database with the Keelwater Instruments demo. Refuses (returns "skipped")
 * when anything is already there: the seed never touches user data.
 */
export async function seedDemo(): Promise<"seeded" | "skipped"> {
  const db = getDb();
  if (!isEmpty(db)) return "skipped";
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const verifiedAt = new Date();

  const ids = db.transaction((tx) => {
    const people = Object.fromEntries(
      Object.entries(DEMO_PEOPLE).map(([key, p]) => {
        const row = tx
          .insert(users)
          .values({ name: p.name, email: p.email, emailVerified: verifiedAt, passwordHash })
          .returning({ id: users.id })
          .get();
        tx.insert(userSettings).values({ userId: row.id }).run();
        return [key, row.id];
      }),
    ) as Record<keyof typeof DEMO_PEOPLE, string>;

    const team = tx.insert(teams).values({ name: DEMO_TEAM_NAME, createdBy: people.admin }).returning({ id: teams.id }).get();
    for (const [key, p] of Object.entries(DEMO_PEOPLE)) {
      if (p.teamRole) tx.insert(teamMembers).values({ teamId: team.id, userId: people[key as keyof typeof DEMO_PEOPLE], role: p.teamRole }).run();
    }
    for (const part of Object.values(DEMO_PARTS)) {
      const { label, ...model } = part;
      tx.insert(parts).values({ teamId: team.id, name: label, model: JSON.stringify({ label, ...model }), createdBy: people.admin }).run();
    }
    return { people, teamId: team.id };
  });

  const { people, teamId } = ids;
  const demo = [
    { doc: hullVibration, by: people.engineerA, reviewState: "approved" as const },
    { doc: ballastPressure, by: people.engineerB, reviewState: "changes-requested" as const },
    { doc: turbidityPhotodiode, by: people.engineerA, reviewState: "draft" as const },
  ];
  const chainIds: string[] = [];
  for (const { doc, by, reviewState } of demo) {
    const worstStatus = worstStatusOf(doc);
    const row = insertChain({ teamId, name: doc.name, document: doc, userId: by, worstStatus, summary: "Demo chain" });
    db.update(chains).set({ reviewState }).where(eq(chains.id, row.id)).run();
    chainIds.push(row.id);
  }
  // the outsider sees the hull vibration chain only; Ines helps edit the turbidity chain
  db.insert(chainMembers).values({ chainId: chainIds[0], userId: people.outsider, role: "viewer", grantedBy: people.engineerA }).run();
  db.insert(chainMembers).values({ chainId: chainIds[2], userId: people.engineerB, role: "editor", grantedBy: people.engineerA }).run();
  // everyone signs in with a team; the outsider gets a personal one like any newcomer
  ensurePersonalTeam(people.outsider);
  return "seeded";
}

// `tsx --conditions=react-server db/seed.ts` seeds the database named by DATABASE_PATH.
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  seedDemo()
    .then((outcome) => {
      console.log(outcome === "seeded" ? "Seeded the Keelwater Instruments demo." : "Database is not empty: seed skipped.");
      closeDb();
    })
    .catch((err) => {
      console.error(err);
      process.exit(1);
    });
}
