/**
 * The one Drizzle schema of Chainwright. Property names are camelCase, columns snake_case.
 * The four Auth.js tables keep the property names @auth/drizzle-adapter reads and writes
 * (including the snake_case OAuth token fields of `accounts`), only their SQL names are ours.
 * Row types are inferred from the tables at the bottom of this file.
 */
import {
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
  type AnySQLiteColumn,
} from "drizzle-orm/sqlite-core";
import { CHAIN_FILE_KINDS, CHAIN_ROLES, REVIEW_DECISIONS, REVIEW_STATES, TEAM_ROLES, WORST_STATUSES } from "../lib/domain";

const newId = () => crypto.randomUUID();
const now = () => new Date();

/** created_at column in milliseconds, filled by the application (SQLite has no ms clock default). */
const createdAt = () => integer("created_at", { mode: "timestamp_ms" }).notNull().$defaultFn(now);

// The domain enums live in lib/domain.ts so client code can use them without importing db/; the
// re-export keeps `import { TEAM_ROLES } from "@/db/schema"` working for server code.
export { CHAIN_ROLES, REVIEW_DECISIONS, REVIEW_STATES, TEAM_ROLES, WORST_STATUSES } from "../lib/domain";
export type { ChainRole, ReviewDecision, ReviewState, TeamRole, WorstStatus } from "../lib/domain";

// ---------------------------------------------------------------------------
// Auth.js tables

export const users = sqliteTable("users", {
  id: text("id").primaryKey().$defaultFn(newId),
  name: text("name"),
  email: text("email").unique(),
  emailVerified: integer("email_verified", { mode: "timestamp_ms" }),
  image: text("image"),
  /** bcrypt hash; null for users who only sign in by e-mail link */
  passwordHash: text("password_hash"),
  createdAt: createdAt(),
});

export const accounts = sqliteTable(
  "accounts",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    type: text("type").$type<"email" | "oauth" | "oidc" | "webauthn">().notNull(),
    provider: text("provider").notNull(),
    providerAccountId: text("provider_account_id").notNull(),
    refresh_token: text("refresh_token"),
    access_token: text("access_token"),
    expires_at: integer("expires_at"),
    token_type: text("token_type"),
    scope: text("scope"),
    id_token: text("id_token"),
    session_state: text("session_state"),
  },
  (t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })],
);

export const sessions = sqliteTable("sessions", {
  sessionToken: text("session_token").primaryKey(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
});

export const verificationTokens = sqliteTable(
  "verification_tokens",
  {
    identifier: text("identifier").notNull(),
    token: text("token").notNull(),
    expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);

/**
 * A password sign-up waits here until its e-mail link is followed; only then does the hash
 * move onto the user. Holding it apart stops anyone from planting a password on an address
 * they do not control.
 */
export const pendingSignups = sqliteTable("pending_signups", {
  email: text("email").primaryKey(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  createdAt: createdAt(),
});

export const userSettings = sqliteTable("user_settings", {
  userId: text("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  notifyOnComments: integer("notify_on_comments", { mode: "boolean" }).notNull().default(true),
  notifyOnReviews: integer("notify_on_reviews", { mode: "boolean" }).notNull().default(true),
});

// ---------------------------------------------------------------------------
// Teams

export const teams = sqliteTable("teams", {
  id: text("id").primaryKey().$defaultFn(newId),
  name: text("name").notNull(),
  /** a team made automatically for a user who signed up without one */
  personal: integer("personal", { mode: "boolean" }).notNull().default(false),
  createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: createdAt(),
});

export const teamMembers = sqliteTable(
  "team_members",
  {
    teamId: text("team_id")
      .notNull()
      .references(() => teams.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: TEAM_ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.teamId, t.userId] }), index("team_members_user_idx").on(t.userId)],
);

// ---------------------------------------------------------------------------
// Chains

export const chains = sqliteTable(
  "chains",
  {
    /** random UUID: chain ids appear in URLs and must not be guessable */
    id: text("id").primaryKey().$defaultFn(newId),
    teamId: text("team_id")
      .notNull()
      .references(() => teams.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** the chain document (chain-format.md), draft or complete, as JSON text */
    document: text("document").notNull(),
    /** optimistic concurrency: every save must name the version it started from */
    version: integer("version").notNull().default(1),
    reviewState: text("review_state", { enum: REVIEW_STATES }).notNull().default("draft"),
    /** worst headroom status of the last analysis, for lists; null before any analysis */
    worstStatus: text("worst_status", { enum: WORST_STATUSES }),
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    updatedBy: text("updated_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull().$defaultFn(now),
  },
  (t) => [index("chains_team_idx").on(t.teamId)],
);

export const chainMembers = sqliteTable(
  "chain_members",
  {
    chainId: text("chain_id")
      .notNull()
      .references(() => chains.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: CHAIN_ROLES }).notNull(),
    grantedBy: text("granted_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.chainId, t.userId] }), index("chain_members_user_idx").on(t.userId)],
);

export const revisions = sqliteTable(
  "revisions",
  {
    id: text("id").primaryKey().$defaultFn(newId),
    chainId: text("chain_id")
      .notNull()
      .references(() => chains.id, { onDelete: "cascade" }),
    /** equals the chain version this revision recorded */
    number: integer("number").notNull(),
    document: text("document").notNull(),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    summary: text("summary").notNull().default(""),
    pinned: integer("pinned", { mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
    /** last save folded into this revision (consecutive autosaves by one author); null when never folded */
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }),
    /** how many saves this revision holds (1 unless autosaves were folded into it) */
    saves: integer("saves").notNull().default(1),
  },
  (t) => [uniqueIndex("revisions_chain_number_idx").on(t.chainId, t.number)],
);

export const comments = sqliteTable(
  "comments",
  {
    id: text("id").primaryKey().$defaultFn(newId),
    chainId: text("chain_id")
      .notNull()
      .references(() => chains.id, { onDelete: "cascade" }),
    /** the stage the comment is pinned to; null for the chain as a whole */
    nodeId: text("node_id"),
    parentId: text("parent_id").references((): AnySQLiteColumn => comments.id, { onDelete: "cascade" }),
    body: text("body").notNull(),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }),
    resolvedAt: integer("resolved_at", { mode: "timestamp_ms" }),
    resolvedBy: text("resolved_by").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [index("comments_chain_idx").on(t.chainId)],
);

export const reviews = sqliteTable(
  "reviews",
  {
    id: text("id").primaryKey().$defaultFn(newId),
    chainId: text("chain_id")
      .notNull()
      .references(() => chains.id, { onDelete: "cascade" }),
    revisionId: text("revision_id")
      .notNull()
      .references(() => revisions.id, { onDelete: "cascade" }),
    requestedBy: text("requested_by").references(() => users.id, { onDelete: "set null" }),
    reviewerId: text("reviewer_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    decision: text("decision", { enum: REVIEW_DECISIONS }).notNull().default("pending"),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }),
    /** one review request asks several reviewers: their rows share this id */
    round: text("round"),
    /** the revision the reviewer's decision was about (an approval names what it approved) */
    decidedRevisionId: text("decided_revision_id").references(() => revisions.id, { onDelete: "set null" }),
    /** when the request stopped being the chain's open one, and why (superseded, edited after approval) */
    closedAt: integer("closed_at", { mode: "timestamp_ms" }),
    closedReason: text("closed_reason"),
  },
  (t) => [index("reviews_chain_idx").on(t.chainId)],
);

// ---------------------------------------------------------------------------
// Team library, attached files, invitations, audit

/** A team's op-amp model; `model` holds the JSON of a chain-format part (partSchema). */
export const parts = sqliteTable(
  "parts",
  {
    id: text("id").primaryKey().$defaultFn(newId),
    teamId: text("team_id")
      .notNull()
      .references(() => teams.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    model: text("model").notNull(),
    notes: text("notes").notNull().default(""),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull().$defaultFn(now),
  },
  (t) => [uniqueIndex("parts_team_name_idx").on(t.teamId, t.name)],
);

/**
 * A file attached to a chain: a recorded waveform or a measured response (CSV). The bytes live in
 * the file store (lib/storage: files under the data folder) under `storageKey`; this row is the
 * metadata, written only after the bytes are safely stored.
 */
export const chainFiles = sqliteTable(
  "chain_files",
  {
    id: text("id").primaryKey().$defaultFn(newId),
    chainId: text("chain_id")
      .notNull()
      .references(() => chains.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: CHAIN_FILE_KINDS }).notNull(),
    name: text("name").notNull(),
    storageKey: text("storage_key").notNull().unique(),
    size: integer("size").notNull(),
    sha256: text("sha256").notNull(),
    /** rows of numbers in the file */
    rows: integer("rows").notNull(),
    /** waveforms: samples per second (from the times, or as stated for one column) */
    sampleRate: real("sample_rate"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("chain_files_chain_idx").on(t.chainId)],
);

/** An invitation to a team or to one chain. Only a hash of the token is stored. */
export const invitations = sqliteTable(
  "invitations",
  {
    id: text("id").primaryKey().$defaultFn(newId),
    tokenHash: text("token_hash").notNull().unique(),
    email: text("email").notNull(),
    teamId: text("team_id").references(() => teams.id, { onDelete: "cascade" }),
    chainId: text("chain_id").references(() => chains.id, { onDelete: "cascade" }),
    /** a team role for team invitations, a chain role for chain invitations */
    role: text("role").notNull(),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    usedBy: text("used_by").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [index("invitations_email_idx").on(t.email)],
);

export const auditLog = sqliteTable(
  "audit_log",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    at: integer("at", { mode: "timestamp_ms" }).notNull().$defaultFn(now),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    targetType: text("target_type").notNull(),
    targetId: text("target_id"),
    teamId: text("team_id"),
    /** JSON text with whatever the action needs to be understood later */
    details: text("details").notNull().default("{}"),
  },
  (t) => [index("audit_target_idx").on(t.targetType, t.targetId)],
);

/** One row per counted event (e.g. a sign-in e-mail to an address); old rows are pruned. */
export const rateLimitEvents = sqliteTable(
  "rate_limit_events",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    key: text("key").notNull(),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("rate_limit_key_at_idx").on(t.key, t.at)],
);

// ---------------------------------------------------------------------------
// Inferred row types

export type User = typeof users.$inferSelect;
export type Team = typeof teams.$inferSelect;
export type TeamMember = typeof teamMembers.$inferSelect;
export type ChainRow = typeof chains.$inferSelect;
export type NewChainRow = typeof chains.$inferInsert;
export type ChainMember = typeof chainMembers.$inferSelect;
export type Revision = typeof revisions.$inferSelect;
export type Comment = typeof comments.$inferSelect;
export type Review = typeof reviews.$inferSelect;
export type PartRow = typeof parts.$inferSelect;
export type ChainFile = typeof chainFiles.$inferSelect;
export type Invitation = typeof invitations.$inferSelect;
export type AuditEntry = typeof auditLog.$inferSelect;

