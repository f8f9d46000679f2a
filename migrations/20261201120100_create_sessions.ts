// Server-side sessions behind the JWTs, so a token can be revoked (logout, password
// change, role removal) before it expires.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sessions", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.uuid("program_id").notNullable().references("programs.id").onDelete("CASCADE");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("revoked_at", { useTz: true });
    t.text("revoked_reason");
    t.text("ip");
    t.text("user_agent");
    t.index(["user_id"]);
  });
  await knex.raw(`ALTER TABLE sessions ADD CONSTRAINT sessions_expiry_after_creation CHECK (expires_at > created_at)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("sessions");
}
