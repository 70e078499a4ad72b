/**
 * The product's named states and roles, shared by the database schema (as column enums), the server
 * and client components. This file imports nothing, so a client module can take these without
 * reaching `db/` (which only server code may import; tests/unit/client-imports.test.ts checks that).
 */

/** A person's role in a team (lib/auth/permissions.ts says what each may do). */
export const TEAM_ROLES = ["admin", "engineer", "reviewer"] as const;
export type TeamRole = (typeof TEAM_ROLES)[number];

/** A person's share of one chain. */
export const CHAIN_ROLES = ["owner", "editor", "reviewer", "viewer"] as const;
export type ChainRole = (typeof CHAIN_ROLES)[number];

/** Where a chain stands in review. */
export const REVIEW_STATES = ["draft", "in-review", "changes-requested", "approved"] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

/** The worst rail-headroom status of a chain's stages (the engine's stage status, kept per saved chain). */
export const WORST_STATUSES = ["ok", "tight", "clip"] as const;
export type WorstStatus = (typeof WORST_STATUSES)[number];

/** One reviewer's answer to a review request. */
export const REVIEW_DECISIONS = ["pending", "approved", "changes-requested"] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];

/** What a file attached to a chain holds: a recorded waveform or a measured frequency response (CSV). */
export const CHAIN_FILE_KINDS = ["waveform", "response"] as const;
export type ChainFileKind = (typeof CHAIN_FILE_KINDS)[number];
