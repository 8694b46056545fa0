// Tables only. Every table of the product is here from the start, so later work adds
// columns and migrations, never a new shape. Ids are opaque text (UUIDs by default).
import { randomUUID } from "node:crypto";
import { sql } from "drizzle-orm";
import {
  bigserial,
  boolean,
  check,
  customType,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  type AnyPgColumn,
} from "drizzle-orm/pg-core";
import { roles } from "@tributary/contracts";

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => randomUUID());
const at = (name: string) => timestamp(name, { withTimezone: true, mode: "date" });
const createdAt = () => at("created_at").notNull().defaultNow();

/** Raw bytes (e.g. packed Float64 draws). PGlite returns Uint8Array for bytea. */
const bytea = customType<{ data: Uint8Array; driverData: Uint8Array }>({
  dataType: () => "bytea",
});

export const runStatuses = ["queued", "running", "succeeded", "failed", "cancelled", "interrupted"] as const;
export const flagKinds = ["data_problem", "real_difference", "needs_lift_test"] as const;
export const planKinds = ["scenario", "budget_split"] as const;
export const planStatuses = ["draft", "submitted", "approved", "rejected"] as const;

const inList = (column: string, values: readonly string[]) =>
  sql.raw(`${column} in (${values.map((v) => `'${v}'`).join(", ")})`);

// ── people ────────────────────────────────────────────────────────────────────

export const users = pgTable(
  "users",
  {
    id: id(),
    /** Stored lower-case; sign-in lower-cases the input the same way. */
    email: text("email").notNull().unique(),
    name: text("name").notNull(),
    role: text("role", { enum: roles }).notNull(),
    /** argon2id hash; null until the invitation is accepted and a password chosen. */
    passwordHash: text("password_hash"),
    disabled: boolean("disabled").notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [check("users_role_check", inList("role", roles))],
);

/** Markets a market manager may see. Other roles see every market and have no rows here. */
export const userMarkets = pgTable(
  "user_markets",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    marketId: text("market_id")
      .notNull()
      .references(() => markets.id, { onDelete: "cascade" }),
  },
  (t) => [primaryKey({ columns: [t.userId, t.marketId] })],
);

/** Sign-in sessions (lucia). */
export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: at("expires_at").notNull(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const invitations = pgTable(
  "invitations",
  {
    id: id(),
    email: text("email").notNull(),
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text("token_hash").notNull().unique(),
    role: text("role", { enum: roles }).notNull(),
    marketIds: text("market_ids").array().notNull().default(sql`'{}'::text[]`),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    expiresAt: at("expires_at").notNull(),
    acceptedAt: at("accepted_at"),
    acceptedUserId: text("accepted_user_id").references(() => users.id, { onDelete: "set null" }),
    revokedAt: at("revoked_at"),
  },
  (t) => [check("invitations_role_check", inList("role", roles))],
);

// ── portfolio ─────────────────────────────────────────────────────────────────

/** One row (id = 1): the workspace's company name and reporting currency. */
export const workspaceSettings = pgTable(
  "workspace_settings",
  {
    id: integer("id").primaryKey().default(1),
    companyName: text("company_name").notNull(),
    /** ISO 4217 code, e.g. "EUR". */
    currency: text("currency").notNull(),
    updatedAt: at("updated_at").notNull().defaultNow(),
  },
  (t) => [check("workspace_settings_single_row", sql`${t.id} = 1`)],
);

export const brands = pgTable("brands", {
  id: id(),
  code: text("code").notNull().unique(),
  name: text("name").notNull(),
  /** What a new customer is worth to the brand, in the reporting currency. */
  customerValue: doublePrecision("customer_value"),
  createdAt: createdAt(),
});

export const markets = pgTable("markets", {
  id: id(),
  code: text("code").notNull().unique(),
  name: text("name").notNull(),
  createdAt: createdAt(),
});

export const channels = pgTable("channels", {
  id: id(),
  code: text("code").notNull().unique(),
  name: text("name").notNull(),
  /** Display order. */
  position: integer("position").notNull(),
  createdAt: createdAt(),
});

/** A brand × market pair. */
export const cells = pgTable(
  "cells",
  {
    id: id(),
    brandId: text("brand_id")
      .notNull()
      .references(() => brands.id, { onDelete: "restrict" }),
    marketId: text("market_id")
      .notNull()
      .references(() => markets.id, { onDelete: "restrict" }),
    createdAt: createdAt(),
  },
  (t) => [unique("cells_brand_market_unique").on(t.brandId, t.marketId), index("cells_market_idx").on(t.marketId)],
);

// ── data ──────────────────────────────────────────────────────────────────────

/** An uploaded dataset. Immutable once written (a database trigger refuses updates). */
export const datasetVersions = pgTable("dataset_versions", {
  id: id(),
  number: integer("number").notNull().unique(),
  fileName: text("file_name").notNull(),
  outcomeColumn: text("outcome_column").notNull(),
  /** Channel codes, in the order of every row's `spend` array. */
  channelCodes: text("channel_codes").array().notNull(),
  /** Control column names, in the order of every row's `controls` array. */
  controlNames: text("control_names").array().notNull(),
  columnMapping: jsonb("column_mapping").notNull(),
  validationReport: jsonb("validation_report").notNull(),
  /** The uploader's note on what changed in this version. */
  note: text("note"),
  createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: createdAt(),
});

/** One week of one cell in one dataset version. */
export const datasetRows = pgTable(
  "dataset_rows",
  {
    datasetVersionId: text("dataset_version_id")
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    cellId: text("cell_id")
      .notNull()
      .references(() => cells.id, { onDelete: "restrict" }),
    /** Monday of the week. */
    week: date("week", { mode: "string" }).notNull(),
    outcome: doublePrecision("outcome").notNull(),
    /** Aligned with the version's `channelCodes`. */
    spend: doublePrecision("spend").array().notNull(),
    /** Aligned with the version's `controlNames`. */
    controls: doublePrecision("controls").array().notNull(),
  },
  (t) => [primaryKey({ name: "dataset_rows_version_cell_week", columns: [t.datasetVersionId, t.cellId, t.week] })],
);

export const liftTests = pgTable(
  "lift_tests",
  {
    id: id(),
    datasetVersionId: text("dataset_version_id")
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    cellId: text("cell_id")
      .notNull()
      .references(() => cells.id, { onDelete: "restrict" }),
    channelId: text("channel_id")
      .notNull()
      .references(() => channels.id, { onDelete: "restrict" }),
    firstWeek: date("first_week", { mode: "string" }).notNull(),
    lastWeek: date("last_week", { mode: "string" }).notNull(),
    spend: doublePrecision("spend").notNull(),
    /** Measured incremental outcome over the test. */
    measuredLift: doublePrecision("measured_lift").notNull(),
    standardError: doublePrecision("standard_error").notNull(),
    note: text("note"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("lift_tests_version_idx").on(t.datasetVersionId),
    check("lift_tests_weeks_order", sql`${t.firstWeek} <= ${t.lastWeek}`),
    check("lift_tests_standard_error_positive", sql`${t.standardError} > 0`),
  ],
);

// ── fits ──────────────────────────────────────────────────────────────────────

export const modelSettings = pgTable("model_settings", {
  id: id(),
  datasetVersionId: text("dataset_version_id")
    .notNull()
    .references(() => datasetVersions.id, { onDelete: "restrict" }),
  settings: jsonb("settings").notNull(),
  createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
  createdAt: createdAt(),
});

export const runs = pgTable(
  "runs",
  {
    id: id(),
    datasetVersionId: text("dataset_version_id")
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "restrict" }),
    modelSettingsId: text("model_settings_id")
      .notNull()
      .references(() => modelSettings.id, { onDelete: "restrict" }),
    status: text("status", { enum: runStatuses }).notNull().default("queued"),
    /** Per-chain progress, e.g. iterations done and ETA. */
    progress: jsonb("progress"),
    seed: integer("seed").notNull(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    startedAt: at("started_at"),
    finishedAt: at("finished_at"),
    failureReason: text("failure_reason"),
    diagnostics: jsonb("diagnostics"),
    /** Null until finished; false with reasons in `diagnostics` when checks fail. */
    trustworthy: boolean("trustworthy"),
    publishedAt: at("published_at"),
    publishedBy: text("published_by").references(() => users.id, { onDelete: "set null" }),
    publishReason: text("publish_reason"),
    /** The run this one restarts (same settings), e.g. after the server stopped it. */
    restartedFromRunId: text("restarted_from_run_id").references((): AnyPgColumn => runs.id, { onDelete: "set null" }),
  },
  (t) => [
    check("runs_status_check", inList("status", runStatuses)),
    index("runs_published_idx").on(t.publishedAt),
    index("runs_status_idx").on(t.status),
  ],
);

/** Posterior summaries of a run, one row per kind (e.g. pooled, unpooled, predictive check). */
export const runResults = pgTable(
  "run_results",
  {
    id: id(),
    runId: text("run_id")
      .notNull()
      .references(() => runs.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    summaries: jsonb("summaries").notNull(),
    createdAt: createdAt(),
  },
  (t) => [unique("run_results_run_kind_unique").on(t.runId, t.kind)],
);

/** Thinned posterior draws of one chain, packed as little-endian Float64, draw-major. */
export const runDraws = pgTable(
  "run_draws",
  {
    id: id(),
    runId: text("run_id")
      .notNull()
      .references(() => runs.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    chain: integer("chain").notNull(),
    parameterNames: text("parameter_names").array().notNull(),
    drawCount: integer("draw_count").notNull(),
    draws: bytea("draws").notNull(),
  },
  (t) => [unique("run_draws_run_kind_chain_unique").on(t.runId, t.kind, t.chain)],
);

// ── review and planning ───────────────────────────────────────────────────────

export const flags = pgTable(
  "flags",
  {
    id: id(),
    cellId: text("cell_id")
      .notNull()
      .references(() => cells.id, { onDelete: "cascade" }),
    channelId: text("channel_id")
      .notNull()
      .references(() => channels.id, { onDelete: "cascade" }),
    /** The run under review when the flag was raised, if any. */
    runId: text("run_id").references(() => runs.id, { onDelete: "set null" }),
    kind: text("kind", { enum: flagKinds }).notNull(),
    note: text("note").notNull(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    clearedAt: at("cleared_at"),
    clearedBy: text("cleared_by").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [check("flags_kind_check", inList("kind", flagKinds)), index("flags_cell_idx").on(t.cellId)],
);

export const plans = pgTable(
  "plans",
  {
    id: id(),
    kind: text("kind", { enum: planKinds }).notNull(),
    name: text("name").notNull(),
    runId: text("run_id")
      .notNull()
      .references(() => runs.id, { onDelete: "restrict" }),
    /** Markets the plan touches; a market manager sees a plan only if all are theirs. */
    marketIds: text("market_ids").array().notNull(),
    body: jsonb("body").notNull(),
    status: text("status", { enum: planStatuses }).notNull().default("draft"),
    decisionComment: text("decision_comment"),
    decidedBy: text("decided_by").references(() => users.id, { onDelete: "set null" }),
    decidedAt: at("decided_at"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: at("updated_at").notNull().defaultNow(),
  },
  (t) => [check("plans_kind_check", inList("kind", planKinds)), check("plans_status_check", inList("status", planStatuses))],
);

// ── messages and audit ────────────────────────────────────────────────────────

/** Every e-mail the product sent; in local mode this is the only delivery. */
export const outbox = pgTable(
  "outbox",
  {
    id: id(),
    to: text("to").notNull(),
    /** The recipient's user id when the address belongs to a user. */
    toUserId: text("to_user_id").references(() => users.id, { onDelete: "set null" }),
    subject: text("subject").notNull(),
    text: text("text").notNull(),
    html: text("html"),
    kind: text("kind").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("outbox_created_idx").on(t.createdAt)],
);

export const auditLog = pgTable(
  "audit_log",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    at: at("at").notNull().defaultNow(),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    /** What was acted on, e.g. "user:<id>" or "run:<id>". */
    target: text("target"),
    details: jsonb("details"),
  },
  (t) => [index("audit_log_at_idx").on(t.at)],
);
