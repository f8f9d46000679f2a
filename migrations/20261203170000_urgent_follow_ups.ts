// The patient-safety loop: a reviewer can flag a read as needing clinical follow-up now (the
// reason is kept on the review), which opens an urgent follow-up at once; follow-ups close
// with a structured outcome, the date it was acted on and who acted, and are due by a time
// set from the program's targets (those opened before this are due 72 hours after opening).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("reviews", (t) => t.text("urgent_reason"));
  await knex.schema.alterTable("follow_ups", (t) => {
    t.boolean("urgent").notNullable().defaultTo(false);
    t.uuid("flagged_by").references("users.id").onDelete("SET NULL");
    t.text("outcome");
    t.timestamp("acted_at", { useTz: true });
    t.text("acted_by").notNullable().defaultTo("");
    t.timestamp("due_at", { useTz: true });
  });
  await knex.raw(`UPDATE follow_ups SET due_at = created_at + interval '72 hours'`);
  // The service sets it from the program's targets; this default only covers a bare insert.
  await knex.raw(`ALTER TABLE follow_ups ALTER COLUMN due_at SET NOT NULL, ALTER COLUMN due_at SET DEFAULT now() + interval '72 hours'`);
  await knex.raw(
    `ALTER TABLE follow_ups ADD CONSTRAINT follow_ups_outcome_valid CHECK (outcome IS NULL OR outcome IN ('patient_contacted','no_action_needed','further_imaging_arranged','referred_to_peer_review','harm_identified','unable_to_contact'))`,
  );
  // Closing takes an outcome; rows closed before outcomes existed are left as they were.
  await knex.raw(`ALTER TABLE follow_ups ADD CONSTRAINT follow_ups_closed_has_outcome CHECK (status <> 'closed' OR outcome IS NOT NULL) NOT VALID`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE follow_ups DROP CONSTRAINT follow_ups_closed_has_outcome");
  await knex.raw("ALTER TABLE follow_ups DROP CONSTRAINT follow_ups_outcome_valid");
  await knex.schema.alterTable("follow_ups", (t) => {
    for (const c of ["urgent", "flagged_by", "outcome", "acted_at", "acted_by", "due_at"]) t.dropColumn(c);
  });
  await knex.schema.alterTable("reviews", (t) => t.dropColumn("urgent_reason"));
}
