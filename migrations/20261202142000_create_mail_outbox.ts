// The mail outbox: every e-mail Soundings sends is first a row here, written in the same
// transaction as the change that caused it, then delivered by a sender that retries with
// backoff (server/mail/outbox.ts). A down mail server delays a message; it never loses it.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("mail_outbox", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    // Null for mail that belongs to no single program (a password reset).
    t.uuid("program_id").references("programs.id").onDelete("CASCADE");
    t.text("to").notNullable();
    t.text("subject").notNullable();
    t.text("text").notNullable();
    t.text("html");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer("attempts").notNullable().defaultTo(0);
    t.text("last_error");
    // When the sender may (re)try; null once sent or given up.
    t.timestamp("next_attempt_at", { useTz: true }).defaultTo(knex.fn.now());
    t.timestamp("sent_at", { useTz: true });
  });
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_attempts_valid CHECK (attempts >= 0)`);
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_to_valid CHECK ("to" <> '' AND subject <> '')`);
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_sent_is_final CHECK (sent_at IS NULL OR next_attempt_at IS NULL)`);
  // The sender's only question: what is due now?
  await knex.raw(`CREATE INDEX mail_outbox_due ON mail_outbox (next_attempt_at) WHERE next_attempt_at IS NOT NULL`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("mail_outbox");
}
