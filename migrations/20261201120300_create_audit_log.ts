// Append-only record of who did what, where and when.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("audit_log", (t) => {
    t.bigIncrements("id").primary();
    // Null for events outside a program (a failed sign-in for an unknown address).
    t.uuid("program_id").references("programs.id").onDelete("CASCADE");
    t.uuid("actor_user_id").references("users.id").onDelete("SET NULL");
    t.text("action").notNullable();
    t.text("entity_type");
    t.text("entity_id");
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("ip");
    t.jsonb("details");
    t.index(["program_id", "at"]);
  });
  await knex.raw(`ALTER TABLE audit_log ADD CONSTRAINT audit_log_action_format CHECK (action ~ '^[a-z_]+(\\.[a-z_]+)+$')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("audit_log");
}
