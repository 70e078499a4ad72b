import { describe, expect, it } from "vitest";
import { count, eq } from "drizzle-orm";
import { getDb } from "@/db/connection";
import { listChainsForUser } from "@/db/queries/chains";
import { findUserByEmail } from "@/db/queries/users";
import { chains, parts, teamMembers, users } from "@/db/schema";
import { isEmpty, seedDemo } from "@/db/seed";
import { ballastPressure, hullVibration, turbidityPhotodiode } from "@/db/seed-data/chains";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "@/db/seed-data/people";
import { verifyPassword } from "@/lib/auth/password";
import { validateChain } from "@/lib/chain/schema";
import { analyzeChain } from "@/lib/engine";
import { effectiveChainRole } from "@/lib/auth/permissions";
import { makeUser } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest();

describe("demo chain documents", () => {
  it.each([
    ["hull vibration", hullVibration],
    ["ballast pressure", ballastPressure],
    ["turbidity", turbidityPhotodiode],
  ])("%s is a complete, valid chain", (_name, doc) => {
    const result = validateChain(doc);
    expect(result.ok ? [] : result.errors).toEqual([]);
  });

  it("the ballast chain's in-amp clips at DC: a 10 mV ± 3 mV bridge output × 500 is at and beyond the +5 V rail", () => {
    const valid = validateChain(ballastPressure);
    if (!valid.ok) throw new Error("invalid demo chain");
    const result = analyzeChain(valid.chain);
    const stage = result.paths[0].stages.find((s) => s.id === "gain")!;
    expect(stage.status).toBe("clip");
    // derived from the in-amp gain 1 + 2·rf/rg = 500 on the bridge's DC (2 mV/V · 10 V at half load = 10 mV)
    // less its ±3 mV zero balance: at least 3.5 V before the signal, and the top of the DC interval
    // (6.5 V) is beyond the usable 4.98 V on its own
    expect(stage.dcOut!.min).toBeGreaterThan(3.4);
    expect(stage.dcOut!.max).toBeGreaterThan(4.98);
    // the in-amp's input stage runs out of swing too (vcm 0 ± 500·23 mV/2)
    expect(result.warnings.some((w) => w.nodeId === "gain" && w.code === "inamp-common-mode")).toBe(true);
  });

  it("the hull and turbidity chains clip nowhere, and their sensor checks are quiet", () => {
    for (const doc of [hullVibration, turbidityPhotodiode]) {
      const valid = validateChain(doc);
      if (!valid.ok) throw new Error("invalid demo chain");
      const result = analyzeChain(valid.chain);
      for (const st of result.paths[0].stages) if (st.status) expect(st.status, `${doc.name} ${st.id}`).toBe("ok");
      expect(result.paths[0].adc!.status).toBe("ok");
      const codes = result.warnings.map((w) => w.code);
      for (const code of ["rail-clip", "rail-tight", "adc-range", "tia-stability", "tia-bandwidth", "charge-corner", "input-range"]) expect(codes, doc.name).not.toContain(code);
    }
  });
});

describe("seedDemo", () => {
  it("fills an empty database with the Keelwater team, parts, chains and shares", async () => {
    expect(isEmpty(getDb())).toBe(true);
    expect(await seedDemo()).toBe("seeded");
    const db = getDb();
    expect(db.select({ n: count() }).from(chains).get()?.n).toBe(3);
    expect(db.select({ n: count() }).from(parts).get()?.n).toBe(4);

    const maren = findUserByEmail(DEMO_PEOPLE.admin.email)!;
    expect(await verifyPassword(DEMO_PASSWORD, maren.passwordHash)).toBe(true);
    const roles = db.select({ role: teamMembers.role }).from(teamMembers).innerJoin(users, eq(users.id, teamMembers.userId)).all();
    expect(roles.map((r) => r.role).sort()).toEqual(["admin", "admin", "engineer", "engineer", "reviewer"]); // + outsider's personal team

    const outsider = findUserByEmail(DEMO_PEOPLE.outsider.email)!;
    const seen = listChainsForUser(outsider.id);
    expect(seen.map((c) => c.name)).toEqual([hullVibration.name]);
    expect(effectiveChainRole(seen[0].teamRole, seen[0].chainRole)).toBe("viewer");

    const ballast = db.select().from(chains).where(eq(chains.name, ballastPressure.name)).get()!;
    expect(ballast.worstStatus).toBe("clip");
    expect(JSON.parse(ballast.document)).toEqual(ballastPressure);
  });

  it("never writes into a database that has anything in it", async () => {
    makeUser("existing");
    expect(await seedDemo()).toBe("skipped");
    expect(getDb().select({ n: count() }).from(chains).get()?.n).toBe(0);
    expect(findUserByEmail(DEMO_PEOPLE.admin.email)).toBeUndefined();
  });

  it("runs once: a second call leaves the first seed alone", async () => {
    await seedDemo();
    expect(await seedDemo()).toBe("skipped");
    expect(getDb().select({ n: count() }).from(users).get()?.n).toBe(Object.keys(DEMO_PEOPLE).length);
  });
});
