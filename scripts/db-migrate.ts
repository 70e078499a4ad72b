import { closeDb, getDb } from "../db/connection";
import { env } from "../lib/env";

// `npm run db:migrate`: apply pending migrations to DATABASE_PATH (getDb migrates on open).
getDb();
console.log(`[db] ${env().databasePath} is up to date.`);
closeDb();
