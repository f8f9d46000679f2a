// The mail outbox survives a down mail server: on a database of its own (so no other test
// file's sender can deliver its rows), an invitation and a password reset succeed while
// nothing listens on the SMTP port, their rows wait with the error, and once a fake SMTP
// server comes up on that port they are delivered without anyone asking again.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { freePort } from "../../scripts/lib/postgres";
import { startFakeMail, type FakeMail, type MailDevMessage } from "../../scripts/lib/mail-server";
import { createDb } from "../../server/db/knex";
import { deliverDueMail, queueMail, retryDelaySeconds, type OutboxSettings } from "../../server/mail/outbox";
import type { MailMessage } from "../../server/mail/mailer";
import { makeKit, makeMember, makeProgram, tokenFor, type TestKit } from "./helpers";
import { startTempDatabase, type TempDatabase } from "./temp-database";

let cluster: TempDatabase;
let kit: TestKit;
let smtpPort: number;
let fake: FakeMail | undefined;

beforeAll(async () => {
  cluster = await startTempDatabase("soundings-mail-");
  smtpPort = await freePort();
  kit = makeKit({
    DATABASE_URL: cluster.url,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(smtpPort),
    MAIL_POLL_MS: "200",
    MAIL_RETRY_BASE_SECONDS: "1",
    MAIL_RETRY_MAX_SECONDS: "1",
  });
}, 60_000);
afterAll(async () => {
  await kit?.close();
  await fake?.close();
  cluster?.destroy();
});

async function until<T>(what: string, probe: () => Promise<T | undefined | false>, timeoutMs = 15_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe("mail outbox", () => {
  it("keeps mail while the mail server is down and delivers it once the server is back", async () => {
    const program = await makeProgram(kit.db);
    const admin = await makeMember(kit.db, program.id, ["admin"]);
    const member = await makeMember(kit.db, program.id, ["sonographer"]);
    const invited = "outbox-invitee@test.example";

    const invite = await request(kit.app)
      .post("/api/users/invitations")
      .set("Authorization", `Bearer ${await tokenFor(kit, admin)}`)
      .send({ email: invited, roles: ["reviewer"] });
    expect(invite.status).toBe(201);
    const forgot = await request(kit.app).post("/api/auth/password/forgot").send({ email: member.email });
    expect(forgot.status).toBe(202);

    // Both wait in the outbox with the refused connection as their error, and are retried.
    const waiting = await until("failed attempts", async () => {
      const rows = await kit.db("mail_outbox").whereIn("to", [invited, member.email]).where("attempts", ">=", 2);
      return rows.length === 2 && rows;
    });
    for (const row of waiting) {
      expect(row.sent_at).toBeNull();
      expect(row.last_error).toMatch(/ECONNREFUSED|connect/i);
      expect(row.next_attempt_at).not.toBeNull();
    }
    expect(waiting.find((r) => r.to === invited)?.program_id).toBe(program.id);

    fake = await startFakeMail(smtpPort, await freePort());
    const got = await until("delivery", async () => {
      const all = await fake!.messages();
      const mine = (addr: string) => all.find((m: MailDevMessage) => m.to.some((t) => t.address === addr));
      return mine(invited) && mine(member.email) ? all : undefined;
    });
    expect(got.find((m) => m.to[0].address === invited)?.subject).toContain(program.name);
    expect(got.find((m) => m.to[0].address === member.email)?.subject).toContain("Reset");
    const sent = await until("rows marked sent", async () => {
      const rows = await kit.db("mail_outbox").whereIn("to", [invited, member.email]).whereNotNull("sent_at");
      return rows.length === 2 && rows;
    });
    for (const row of sent) {
      expect(row.next_attempt_at).toBeNull();
      expect(row.last_error).toBeNull();
      // The one-time links are not kept once delivered.
      expect(row.text).toBe("");
      expect(row.html).toBeNull();
    }
  }, 60_000);

  it("queues nothing when the transaction that caused the mail rolls back", async () => {
    const to = "rolled-back@test.example";
    await expect(
      kit.db.transaction(async (trx) => {
        await queueMail(trx, { to, subject: "Never", text: "Never sent" });
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    expect(await kit.db("mail_outbox").where("to", to)).toEqual([]);
  });

  it("sends each message once when several senders share the outbox (FOR UPDATE SKIP LOCKED)", async () => {
    const to = (i: number) => `shared-${i}@test.example`;
    // The kit's own sender takes part too; it needs a mail server that answers.
    fake ??= await startFakeMail(smtpPort, await freePort());
    await queueMail(
      kit.db,
      Array.from({ length: 30 }, (_, i) => ({ to: to(i), subject: "Shared", text: "One each" })),
    );
    const delivered: string[] = [];
    const slowTransport = {
      send: async (m: MailMessage) => {
        await new Promise((r) => setTimeout(r, 5));
        delivered.push(m.to);
      },
      close: () => {},
    };
    const settings: OutboxSettings = { pollMs: 1000, retryBaseSeconds: 1, retryMaxSeconds: 1, maxAttempts: 3, leaseSeconds: 60 };
    const dbs = [createDb(cluster.url, 1), createDb(cluster.url, 1), createDb(cluster.url, 1)];
    try {
      // Three "workers" race for the same due rows until none is left.
      await Promise.all(
        dbs.map(async (db) => {
          while ((await deliverDueMail(db, slowTransport, settings, 4)).sent > 0);
        }),
      );
    } finally {
      await Promise.all(dbs.map((db) => db.destroy()));
    }
    // The kit's own sender races too; whoever claimed a row, it was claimed and sent once.
    expect(new Set(delivered).size).toBe(delivered.length);
    const rows = await until("the kit's sender to finish its claims", async () => {
      const r = await kit.db("mail_outbox").where("subject", "Shared").whereNotNull("sent_at");
      return r.length === 30 && r;
    });
    for (const row of rows) {
      expect(row.sent_at).not.toBeNull();
      expect(row.attempts).toBe(1);
    }
  }, 30_000);

  it("doubles the retry delay per attempt up to the cap", () => {
    const s = { retryBaseSeconds: 30, retryMaxSeconds: 3600 };
    expect([1, 2, 3, 4, 7, 8, 20].map((n) => retryDelaySeconds(n, s))).toEqual([30, 60, 120, 240, 1920, 3600, 3600]);
  });
});
