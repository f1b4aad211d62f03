import { sql } from "drizzle-orm";
import {
  type AnyPgColumn,
  bigint,
  boolean,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";

/*
 * The whole Gatecrash data model. Times are stored in UTC (timestamptz) and shown in the event's time zone.
 * The first five tables belong to better-auth (its field names, our column names); the rest are Gatecrash's.
 */

const ts = (name: string) => timestamp(name, { withTimezone: true, mode: "date" });
const created = () => ts("created_at").notNull().defaultNow();

// ---------- better-auth ----------
export const user = pgTable("user", {
  id: text("id").primaryKey(),
  name: text("name").notNull(),
  email: text("email").notNull().unique(),
  emailVerified: boolean("email_verified").notNull().default(false),
  image: text("image"),
  createdAt: created(),
  updatedAt: ts("updated_at").notNull().defaultNow(),
  // admin plugin
  role: text("role"),
  banned: boolean("banned").default(false),
  banReason: text("ban_reason"),
  banExpires: ts("ban_expires"),
});

export const session = pgTable(
  "session",
  {
    id: text("id").primaryKey(),
    expiresAt: ts("expires_at").notNull(),
    token: text("token").notNull().unique(),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
    ipAddress: text("ip_address"),
    userAgent: text("user_agent"),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    impersonatedBy: text("impersonated_by"),
  },
  (t) => [index("session_user_idx").on(t.userId)],
);

export const account = pgTable(
  "account",
  {
    id: text("id").primaryKey(),
    accountId: text("account_id").notNull(),
    providerId: text("provider_id").notNull(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    accessToken: text("access_token"),
    refreshToken: text("refresh_token"),
    idToken: text("id_token"),
    accessTokenExpiresAt: ts("access_token_expires_at"),
    refreshTokenExpiresAt: ts("refresh_token_expires_at"),
    scope: text("scope"),
    password: text("password"),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [index("account_user_idx").on(t.userId)],
);

export const verification = pgTable(
  "verification",
  {
    id: text("id").primaryKey(),
    identifier: text("identifier").notNull(),
    value: text("value").notNull(),
    expiresAt: ts("expires_at").notNull(),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [index("verification_identifier_idx").on(t.identifier)],
);

export const rateLimit = pgTable("rate_limit", {
  id: text("id").primaryKey(),
  key: text("key").notNull().unique(),
  count: integer("count").notNull(),
  lastRequest: bigint("last_request", { mode: "number" }).notNull(),
});

// ---------- events, roles, competitions ----------
export const eventRoleEnum = pgEnum("event_role", ["organizer", "judge"]);
export const competitionStateEnum = pgEnum("competition_state", ["draft", "open", "closed", "judging", "results"]);
export const ballotMethodEnum = pgEnum("ballot_method", ["points", "borda", "schulze"]);
export const juryMethodEnum = pgEnum("jury_method", ["jury-raw", "jury-z"]);

export const events = pgTable("events", {
  id: uuid("id").primaryKey().defaultRandom(),
  slug: text("slug").notNull().unique(),
  title: text("title").notNull(),
  description: text("description").notNull().default(""),
  venue: text("venue").notNull().default(""),
  timeZone: text("time_zone").notNull(),
  startsAt: ts("starts_at"),
  endsAt: ts("ends_at"),
  createdBy: text("created_by").references(() => user.id),
  createdAt: created(),
});

export const eventRoles = pgTable(
  "event_roles",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    eventId: uuid("event_id")
      .notNull()
      .references(() => events.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    role: eventRoleEnum("role").notNull(),
    createdAt: created(),
  },
  (t) => [uniqueIndex("event_roles_unique").on(t.eventId, t.userId, t.role), index("event_roles_user_idx").on(t.userId)],
);

/** Judge invitations by e-mail; accepted by signing in with the invited address. */
export const judgeInvites = pgTable("judge_invites", {
  id: uuid("id").primaryKey().defaultRandom(),
  eventId: uuid("event_id")
    .notNull()
    .references(() => events.id, { onDelete: "cascade" }),
  email: text("email").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  expiresAt: ts("expires_at").notNull(),
  acceptedAt: ts("accepted_at"),
  createdBy: text("created_by").references(() => user.id),
  createdAt: created(),
});

export const competitions = pgTable(
  "competitions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    eventId: uuid("event_id")
      .notNull()
      .references(() => events.id, { onDelete: "cascade" }),
    slug: text("slug").notNull(),
    title: text("title").notNull(),
    description: text("description").notNull().default(""),
    state: competitionStateEnum("state").notNull().default("draft"),
    deadlineAt: ts("deadline_at"),
    graceMinutes: integer("grace_minutes").notNull().default(0),
    votingOpensAt: ts("voting_opens_at"),
    votingClosesAt: ts("voting_closes_at"),
    /** Entry fee in minor units (cents); 0 = free. */
    feeAmount: integer("fee_amount").notNull().default(0),
    feeCurrency: text("fee_currency").notNull().default("eur"),
    ruleset: jsonb("ruleset"),
    rulesetVersion: integer("ruleset_version").notNull().default(1),
    ballotMethod: ballotMethodEnum("ballot_method").notNull().default("points"),
    juryMethod: juryMethodEnum("jury_method").notNull().default("jury-z"),
    juryWeightPct: integer("jury_weight_pct").notNull().default(70),
    blindJudging: boolean("blind_judging").notNull().default(true),
    orderMode: text("order_mode").notNull().default("shared"), // shared | per-judge
    orderSeed: text("order_seed").notNull().default(sql`'v2:' || md5(random()::text)`),
    judgingLocked: boolean("judging_locked").notNull().default(false),
    /** When the compo's entries are shown on the big screen (the party timetable); null = not scheduled yet. */
    showStartsAt: ts("show_starts_at"),
    showMinutes: integer("show_minutes").notNull().default(60),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [uniqueIndex("competitions_event_slug").on(t.eventId, t.slug)],
);

export const criteria = pgTable("criteria", {
  id: uuid("id").primaryKey().defaultRandom(),
  competitionId: uuid("competition_id")
    .notNull()
    .references(() => competitions.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  weight: doublePrecision("weight").notNull().default(1),
  scaleMin: integer("scale_min").notNull().default(0),
  scaleMax: integer("scale_max").notNull().default(10),
  position: integer("position").notNull().default(0),
});

// ---------- crews and entries ----------
export const crews = pgTable("crews", {
  id: uuid("id").primaryKey().defaultRandom(),
  handle: text("handle").notNull().unique(),
  name: text("name").notNull(),
  createdBy: text("created_by").references(() => user.id),
  createdAt: created(),
});

export const crewMembers = pgTable(
  "crew_members",
  {
    crewId: uuid("crew_id")
      .notNull()
      .references(() => crews.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    role: text("role").notNull().default("member"), // captain | member
    joinedAt: ts("joined_at").notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.crewId, t.userId] }), index("crew_members_user_idx").on(t.userId)],
);

export const crewInvites = pgTable("crew_invites", {
  id: uuid("id").primaryKey().defaultRandom(),
  crewId: uuid("crew_id")
    .notNull()
    .references(() => crews.id, { onDelete: "cascade" }),
  email: text("email").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  expiresAt: ts("expires_at").notNull(),
  acceptedAt: ts("accepted_at"),
  createdBy: text("created_by").references(() => user.id),
  createdAt: created(),
});

export const entryStateEnum = pgEnum("entry_state", ["active", "disqualified", "withdrawn"]);
export const feeStateEnum = pgEnum("fee_state", ["not_required", "unpaid", "pending", "paid", "refunded"]);

export const entries = pgTable(
  "entries",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    competitionId: uuid("competition_id")
      .notNull()
      .references(() => competitions.id, { onDelete: "cascade" }),
    crewId: uuid("crew_id")
      .notNull()
      .references(() => crews.id),
    title: text("title").notNull(),
    description: text("description").notNull().default(""),
    state: entryStateEnum("state").notNull().default("active"),
    disqualifiedReason: text("disqualified_reason"),
    feeState: feeStateEnum("fee_state").notNull().default("unpaid"),
    /** The crew's pick among its on-time uploads; null: the newest on-time upload counts. */
    finalUploadId: uuid("final_upload_id").references((): AnyPgColumn => uploads.id, { onDelete: "set null" }),
    /** An organizer's late exception for this one entry: uploads until then count; the reason is shown to the jury. */
    lateUntil: ts("late_until"),
    lateReason: text("late_reason"),
    lateGrantedBy: text("late_granted_by").references(() => user.id, { onDelete: "set null" }),
    lateGrantedAt: ts("late_granted_at"),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [uniqueIndex("entries_competition_crew").on(t.competitionId, t.crewId), index("entries_crew_idx").on(t.crewId)],
);

export const uploadStateEnum = pgEnum("upload_state", ["pending", "complete", "late", "abandoned"]);

/** An upload is immutable once complete; the newest complete, on-time upload counts. */
export const uploads = pgTable(
  "uploads",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    entryId: uuid("entry_id")
      .notNull()
      .references(() => entries.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    state: uploadStateEnum("state").notNull().default("pending"),
    submittedBy: text("submitted_by").references(() => user.id),
    /** Sources by repository link instead of a bundle file: the link and the full commit hash the crew gave. */
    repositoryUrl: text("repository_url"),
    repositoryCommit: text("repository_commit"),
    /** The licence of the upload's sources, an SPDX license expression. */
    licence: text("licence"),
    /** Recorded after the deadline, within the organizer's late exception for the entry. */
    lateException: boolean("late_exception").notNull().default(false),
    createdAt: created(),
    completedAt: ts("completed_at"),
  },
  (t) => [uniqueIndex("uploads_entry_number").on(t.entryId, t.number)],
);

export const fileKindEnum = pgEnum("file_kind", ["bundle", "layout", "video", "still"]);

export const uploadFiles = pgTable(
  "upload_files",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    uploadId: uuid("upload_id")
      .notNull()
      .references(() => uploads.id, { onDelete: "cascade" }),
    kind: fileKindEnum("kind").notNull(),
    s3Key: text("s3_key").notNull().unique(),
    filename: text("filename").notNull(),
    claimedBytes: bigint("claimed_bytes", { mode: "number" }).notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }),
    sha256: text("sha256"),
    mediaType: text("media_type"),
    multipartUploadId: text("multipart_upload_id"),
    /** Parts the browser reported as stored ({partNumber, etag, size}); used to resume where the store cannot list parts. */
    parts: jsonb("parts").$type<{ partNumber: number; etag: string; size: number }[]>().notNull().default([]),
    state: text("state").notNull().default("uploading"), // uploading | confirmed | rejected
    rejectReason: text("reject_reason"),
    createdAt: created(),
    confirmedAt: ts("confirmed_at"),
  },
  (t) => [uniqueIndex("upload_files_upload_kind").on(t.uploadId, t.kind)],
);

// ---------- conformance ----------
export const checkRunStateEnum = pgEnum("check_run_state", ["queued", "running", "done", "error", "superseded"]);
export const verdictEnum = pgEnum("verdict", ["pass", "warn", "fail"]);

export const checkRuns = pgTable(
  "check_runs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    uploadId: uuid("upload_id")
      .notNull()
      .references(() => uploads.id, { onDelete: "cascade" }),
    state: checkRunStateEnum("state").notNull().default("queued"),
    step: text("step"),
    verdict: verdictEnum("verdict"),
    attempts: integer("attempts").notNull().default(0),
    /** Figures the steps measured (source, layout, video, audio, flash, speed) for the report and the showcase. */
    figures: jsonb("figures").notNull().default({}),
    log: text("log").notNull().default(""),
    error: text("error"),
    queuedAt: ts("queued_at").notNull().defaultNow(),
    startedAt: ts("started_at"),
    finishedAt: ts("finished_at"),
  },
  (t) => [index("check_runs_upload_idx").on(t.uploadId)],
);

export const findings = pgTable(
  "findings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    checkRunId: uuid("check_run_id")
      .notNull()
      .references(() => checkRuns.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    step: text("step").notNull(),
    rule: text("rule").notNull(),
    verdict: verdictEnum("verdict").notNull(),
    title: text("title").notNull(),
    measured: text("measured"),
    limitValue: text("limit_value"),
    evidence: text("evidence"),
    advice: text("advice"),
  },
  (t) => [index("findings_run_idx").on(t.checkRunId)],
);

export const artifacts = pgTable(
  "artifacts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    checkRunId: uuid("check_run_id")
      .notNull()
      .references(() => checkRuns.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(), // first-frame | contact-sheet | webm | mp4 | wav | waveform | layout-svg | layout-png
    s3Key: text("s3_key").notNull().unique(),
    mediaType: text("media_type").notNull(),
    sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
    sha256: text("sha256").notNull(),
    createdAt: created(),
  },
  (t) => [uniqueIndex("artifacts_run_kind").on(t.checkRunId, t.kind)],
);

// ---------- payments ----------
export const payments = pgTable("payments", {
  id: uuid("id").primaryKey().defaultRandom(),
  entryId: uuid("entry_id")
    .notNull()
    .references(() => entries.id, { onDelete: "cascade" }),
  checkoutSessionId: text("checkout_session_id").notNull().unique(),
  paymentIntentId: text("payment_intent_id"),
  amount: integer("amount").notNull(),
  currency: text("currency").notNull(),
  state: text("state").notNull().default("open"), // open | paid | expired | refunded | partially_refunded
  refundedAmount: integer("refunded_amount").notNull().default(0),
  createdAt: created(),
  updatedAt: ts("updated_at").notNull().defaultNow(),
});

/** Every webhook event id we applied: a repeat delivery finds its id here and changes nothing. */
export const webhookEvents = pgTable("webhook_events", {
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  objectCreatedAt: ts("object_created_at"),
  receivedAt: ts("received_at").notNull().defaultNow(),
  payload: jsonb("payload").notNull(),
});

// ---------- judging ----------
export const juryAssignments = pgTable(
  "jury_assignments",
  {
    competitionId: uuid("competition_id")
      .notNull()
      .references(() => competitions.id, { onDelete: "cascade" }),
    judgeUserId: text("judge_user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    orderSeed: text("order_seed").notNull().default(sql`'v2:' || md5(random()::text)`),
    createdAt: created(),
  },
  (t) => [primaryKey({ columns: [t.competitionId, t.judgeUserId] })],
);

export const conflicts = pgTable(
  "conflicts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    entryId: uuid("entry_id")
      .notNull()
      .references(() => entries.id, { onDelete: "cascade" }),
    judgeUserId: text("judge_user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    reason: text("reason").notNull(),
    declaredBy: text("declared_by").references(() => user.id),
    createdAt: created(),
  },
  (t) => [uniqueIndex("conflicts_entry_judge").on(t.entryId, t.judgeUserId)],
);

/** One judge's sheet for one entry: the note and a version for optimistic concurrency. */
export const scoresheets = pgTable(
  "scoresheets",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    entryId: uuid("entry_id")
      .notNull()
      .references(() => entries.id, { onDelete: "cascade" }),
    judgeUserId: text("judge_user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    note: text("note").notNull().default(""),
    version: integer("version").notNull().default(0),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [uniqueIndex("scoresheets_entry_judge").on(t.entryId, t.judgeUserId)],
);

export const scores = pgTable(
  "scores",
  {
    scoresheetId: uuid("scoresheet_id")
      .notNull()
      .references(() => scoresheets.id, { onDelete: "cascade" }),
    criterionId: uuid("criterion_id")
      .notNull()
      .references(() => criteria.id, { onDelete: "cascade" }),
    value: doublePrecision("value").notNull(),
    version: integer("version").notNull().default(1),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.scoresheetId, t.criterionId] })],
);

export const scoreHistory = pgTable(
  "score_history",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    scoresheetId: uuid("scoresheet_id")
      .notNull()
      .references(() => scoresheets.id, { onDelete: "cascade" }),
    /** null when the note changed */
    criterionId: uuid("criterion_id").references(() => criteria.id, { onDelete: "cascade" }),
    oldValue: text("old_value"),
    newValue: text("new_value"),
    changedBy: text("changed_by").references(() => user.id),
    changedAt: ts("changed_at").notNull().defaultNow(),
  },
  (t) => [index("score_history_sheet_idx").on(t.scoresheetId)],
);

// ---------- audience ----------
/**
 * A vote code is one slip. It belongs to a party and votes in the compos of its scope rows: one row for a
 * compo's own sheet, several for a party-wide sheet. It is redeemed once per compo (vote_code_scopes.redeemed_at).
 */
export const voteCodes = pgTable(
  "vote_codes",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    eventId: uuid("event_id")
      .notNull()
      .references(() => events.id, { onDelete: "cascade" }),
    code: text("code").notNull().unique(),
    /** true: printed on the party-wide sheet; false: on one compo's own sheet. */
    partyWide: boolean("party_wide").notNull().default(false),
    createdAt: created(),
  },
  (t) => [index("vote_codes_event_idx").on(t.eventId)],
);

export const voteCodeScopes = pgTable(
  "vote_code_scopes",
  {
    voteCodeId: uuid("vote_code_id")
      .notNull()
      .references(() => voteCodes.id, { onDelete: "cascade" }),
    competitionId: uuid("competition_id")
      .notNull()
      .references(() => competitions.id, { onDelete: "cascade" }),
    redeemedAt: ts("redeemed_at"),
  },
  (t) => [primaryKey({ columns: [t.voteCodeId, t.competitionId] }), index("vote_code_scopes_competition_idx").on(t.competitionId)],
);

export const ballots = pgTable(
  "ballots",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    competitionId: uuid("competition_id")
      .notNull()
      .references(() => competitions.id, { onDelete: "cascade" }),
    voterUserId: text("voter_user_id").references(() => user.id, { onDelete: "set null" }),
    voteCodeId: uuid("vote_code_id").references(() => voteCodes.id),
    method: ballotMethodEnum("method").notNull(),
    /** {ranking: [entryId…]} or {points: {entryId: n}} */
    content: jsonb("content").notNull(),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("ballots_competition_voter").on(t.competitionId, t.voterUserId),
    uniqueIndex("ballots_competition_code").on(t.competitionId, t.voteCodeId),
  ],
);

export const ballotHistory = pgTable("ballot_history", {
  id: uuid("id").primaryKey().defaultRandom(),
  ballotId: uuid("ballot_id")
    .notNull()
    .references(() => ballots.id, { onDelete: "cascade" }),
  content: jsonb("content").notNull(),
  changedAt: ts("changed_at").notNull().defaultNow(),
});

/** Published results: frozen; a correction is a new version, never an update. */
export const resultsSnapshots = pgTable(
  "results_snapshots",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    competitionId: uuid("competition_id")
      .notNull()
      .references(() => competitions.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    payload: jsonb("payload").notNull(),
    sha256: text("sha256").notNull(),
    /** How sha256 was made (app/results/canonical.ts); versions from before the tag keep the earlier scheme. */
    hashScheme: text("hash_scheme").notNull().default("gatecrash-json/1"),
    note: text("note").notNull().default(""),
    publishedBy: text("published_by").references(() => user.id),
    publishedAt: ts("published_at").notNull().defaultNow(),
  },
  (t) => [uniqueIndex("results_competition_version").on(t.competitionId, t.version)],
);

/** A party's special awards (jury's choice, best sound …), each with at most one winning entry. */
export const awards = pgTable(
  "awards",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    eventId: uuid("event_id")
      .notNull()
      .references(() => events.id, { onDelete: "cascade" }),
    title: text("title").notNull(),
    citation: text("citation").notNull().default(""),
    winnerEntryId: uuid("winner_entry_id").references(() => entries.id, { onDelete: "set null" }),
    position: integer("position").notNull().default(0),
    createdAt: created(),
    updatedAt: ts("updated_at").notNull().defaultNow(),
  },
  (t) => [index("awards_event_idx").on(t.eventId)],
);

// ---------- mail and audit ----------
export const outbox = pgTable(
  "outbox",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: text("html_body").notNull(),
    /** Makes enqueueing idempotent (e.g. one receipt per upload). */
    dedupeKey: text("dedupe_key").unique(),
    state: text("state").notNull().default("pending"), // pending | sent | failed
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    createdAt: created(),
    sentAt: ts("sent_at"),
  },
  (t) => [index("outbox_state_idx").on(t.state)],
);

export const auditLog = pgTable(
  "audit_log",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    at: ts("at").notNull().defaultNow(),
    actorUserId: text("actor_user_id").references(() => user.id, { onDelete: "set null" }),
    eventId: uuid("event_id").references(() => events.id, { onDelete: "cascade" }),
    action: text("action").notNull(),
    subjectType: text("subject_type").notNull(),
    subjectId: text("subject_id").notNull(),
    details: jsonb("details").notNull().default({}),
  },
  (t) => [index("audit_event_idx").on(t.eventId)],
);

/**
 * Stage mode's per-entry choices: which file the big screen plays (the reference capture, or the crew's own
 * video when its own flash verdict passed) and an organizer's sign-off to show a flagged entry, bound to the
 * upload it was given for (a new counting upload needs a new sign-off). The audit log keeps who and when.
 */
export const stagePlays = pgTable("stage_plays", {
  entryId: uuid("entry_id")
    .primaryKey()
    .references(() => entries.id, { onDelete: "cascade" }),
  source: text("source").notNull().default("reference"), // reference | crew
  signedOffUploadId: uuid("signed_off_upload_id").references(() => uploads.id, { onDelete: "set null" }),
  signedOffBy: text("signed_off_by").references(() => user.id, { onDelete: "set null" }),
  signedOffAt: ts("signed_off_at"),
  updatedAt: ts("updated_at").notNull().defaultNow(),
});
