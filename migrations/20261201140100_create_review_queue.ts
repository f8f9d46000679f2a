// The review queue: assignments (a lease a reviewer claims), the reviews submitted against
// them, autosaved drafts, each exam's final result and per-finding outcomes, follow-ups,
// feedback snippets, notifications, acknowledgements and replies.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE exams DROP CONSTRAINT exams_status_valid`);
  await knex.raw(`ALTER TABLE exams ADD CONSTRAINT exams_status_valid CHECK (status IN ('draft','submitted','in_review','adjudication','reviewed'))`);
  await knex.schema.alterTable("exams", (t) => {
    t.boolean("double_read").notNullable().defaultTo(false);
  });

  await knex.schema.createTable("assignments", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.text("kind").notNullable();
    t.text("state").notNullable().defaultTo("open");
    // Who holds (or held) the claim.
    t.uuid("reviewer_id").references("users.id");
    // A qa_lead's direct assignment: only this reviewer may claim it.
    t.uuid("assigned_to").references("users.id");
    // The rubric version the reviewer scores under, fixed at claim time.
    t.uuid("rubric_id").references("rubrics.id");
    t.timestamp("claimed_at", { useTz: true });
    t.timestamp("lease_expires_at", { useTz: true });
    // Ordering key of the queue: clinical exams first, then the oldest.
    t.integer("priority").notNullable().defaultTo(1);
    t.timestamp("due_at", { useTz: true }).notNullable();
    t.timestamp("submitted_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["program_id", "state", "priority", "due_at"]);
    t.index(["exam_id"]);
  });
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_kind_valid CHECK (kind IN ('primary','second','adjudication'))`);
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_state_valid CHECK (state IN ('open','claimed','submitted','cancelled'))`);
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_claim_consistent CHECK (
    (state = 'open' AND lease_expires_at IS NULL) OR (state = 'claimed' AND reviewer_id IS NOT NULL AND lease_expires_at IS NOT NULL) OR state IN ('submitted','cancelled'))`);
  // One read per reviewer per exam: a second read is always by someone else.
  await knex.raw(
    `CREATE UNIQUE INDEX assignments_one_per_reviewer ON assignments (exam_id, reviewer_id) WHERE reviewer_id IS NOT NULL AND state <> 'cancelled'`,
  );
  await knex.raw(`CREATE UNIQUE INDEX assignments_one_of_each_kind ON assignments (exam_id, kind) WHERE state <> 'cancelled'`);

  await knex.schema.createTable("reviews", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("assignment_id").notNullable().unique().references("assignments.id").onDelete("CASCADE");
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.uuid("reviewer_id").notNullable().references("users.id");
    t.uuid("rubric_id").notNullable().references("rubrics.id");
    t.jsonb("scores").notNullable();
    t.jsonb("reads").notNullable().defaultTo("[]");
    t.text("feedback").notNullable().defaultTo("");
    t.integer("time_spent_seconds").notNullable().defaultTo(0);
    t.boolean("credit").notNullable();
    t.boolean("significant_disagreement").notNullable().defaultTo(false);
    t.timestamp("submitted_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["exam_id"]);
    t.index(["program_id", "submitted_at"]);
    t.index(["reviewer_id", "submitted_at"]);
  });

  await knex.schema.createTable("review_drafts", (t) => {
    t.uuid("assignment_id").primary().references("assignments.id").onDelete("CASCADE");
    t.jsonb("data").notNullable();
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("exam_results", (t) => {
    t.uuid("exam_id").primary().references("exams.id").onDelete("CASCADE");
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("rubric_id").notNullable().references("rubrics.id");
    t.jsonb("scores").notNullable();
    t.jsonb("reads").notNullable();
    t.text("source").notNullable();
    t.uuid("decided_by").references("users.id");
    t.boolean("credit").notNullable();
    t.text("note").notNullable().defaultTo("");
    t.timestamp("decided_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE exam_results ADD CONSTRAINT exam_results_source_valid CHECK (source IN ('single_read','double_read_agreed','adjudicated'))`);

  await knex.schema.createTable("finding_outcomes", (t) => {
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.text("finding_key").notNullable();
    t.text("sonographer_read").notNullable();
    t.text("reference_read").notNullable();
    t.text("outcome").notNullable();
    t.primary(["exam_id", "finding_key"]);
  });
  await knex.raw(`ALTER TABLE finding_outcomes ADD CONSTRAINT finding_outcomes_outcome_valid CHECK (outcome IN ('TP','FP','TN','FN','indeterminate'))`);

  await knex.schema.createTable("follow_ups", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.uuid("review_id").references("reviews.id").onDelete("SET NULL");
    t.text("reason").notNullable();
    t.text("status").notNullable().defaultTo("open");
    t.text("note").notNullable().defaultTo("");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("closed_at", { useTz: true });
    t.uuid("closed_by").references("users.id");
    t.index(["program_id", "status"]);
  });
  await knex.raw(`ALTER TABLE follow_ups ADD CONSTRAINT follow_ups_status_valid CHECK (status IN ('open','in_progress','closed'))`);

  await knex.schema.createTable("snippets", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.text("criterion_key");
    t.text("text").notNullable();
    t.uuid("created_by").references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["program_id"]);
  });

  await knex.schema.createTable("notifications", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("kind").notNullable();
    t.uuid("exam_id").references("exams.id").onDelete("CASCADE");
    t.text("body").notNullable();
    t.timestamp("read_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["user_id", "read_at"]);
  });

  await knex.schema.createTable("feedback_messages", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.uuid("exam_id").notNullable().references("exams.id").onDelete("CASCADE");
    t.uuid("author_id").notNullable().references("users.id");
    t.text("body").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["exam_id"]);
  });
  await knex.schema.alterTable("exams", (t) => {
    t.timestamp("feedback_acknowledged_at", { useTz: true });
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const t of [
    "feedback_messages",
    "notifications",
    "snippets",
    "follow_ups",
    "finding_outcomes",
    "exam_results",
    "review_drafts",
    "reviews",
    "assignments",
  ])
    await knex.schema.dropTable(t);
  await knex.schema.alterTable("exams", (t) => {
    t.dropColumn("double_read");
    t.dropColumn("feedback_acknowledged_at");
  });
}
