// The mail outbox. Callers queue a message as a row of `mail_outbox`, in the transaction of
// the change that causes it (a rolled-back change mails no one; a committed one always
// does). A sender, run by every worker process, delivers due rows over SMTP and retries
// failures with exponential backoff; rows are claimed with FOR UPDATE SKIP LOCKED and a
// lease, so any number of workers can share one outbox without sending a message twice
// (unless a worker dies between the SMTP hand-off and recording it: at least once).
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { MailMessage, Mailer } from "./mailer";

export interface OutboxSettings {
  /** How often the sender looks for due mail, in milliseconds. */
  pollMs: number;
  /** First retry delay; doubled per attempt up to `retryMaxSeconds`. */
  retryBaseSeconds: number;
  retryMaxSeconds: number;
  /** After this many failed attempts a message is given up (kept, with its last error). */
  maxAttempts: number;
  /** A claimed row is retried after this long if its sender vanished mid-send. */
  leaseSeconds: number;
}

// Senders in this process, woken when a transaction that queued mail commits.
const wakers = new Set<() => void>();
const wakeSenders = () => wakers.forEach((w) => w());

/** Queues e-mail; pass the caller's transaction so the message commits with its cause. */
export async function queueMail(db: Db | Knex.Transaction, messages: MailMessage | MailMessage[], programId: string | null = null): Promise<void> {
  const list = Array.isArray(messages) ? messages : [messages];
  if (list.length === 0) return;
  await db("mail_outbox").insert(list.map((m) => ({ program_id: programId, to: m.to, subject: m.subject, text: m.text, html: m.html ?? null })));
  if (db.isTransaction) (db as Knex.Transaction).executionPromise.then(wakeSenders, () => undefined);
  else wakeSenders();
}

/** Seconds to wait after the `attempts`-th failed attempt (1-based): base · 2^(attempts−1), capped. */
export function retryDelaySeconds(attempts: number, s: Pick<OutboxSettings, "retryBaseSeconds" | "retryMaxSeconds">): number {
  return Math.min(s.retryMaxSeconds, s.retryBaseSeconds * 2 ** Math.max(0, attempts - 1));
}

interface OutboxRow {
  id: string;
  to: string;
  subject: string;
  text: string;
  html: string | null;
  attempts: number;
}

/** Delivers up to `limit` due messages once; returns how many were sent and how many failed. */
export async function deliverDueMail(db: Db, transport: Mailer, s: OutboxSettings, limit = 20): Promise<{ sent: number; failed: number }> {
  // Claim: the lease moves next_attempt_at ahead, so another worker skips these rows.
  const { rows } = (await db.raw(
    `UPDATE mail_outbox SET attempts = attempts + 1, next_attempt_at = now() + make_interval(secs => ?)
      WHERE id IN (SELECT id FROM mail_outbox WHERE next_attempt_at <= now() ORDER BY next_attempt_at LIMIT ? FOR UPDATE SKIP LOCKED)
      RETURNING id, "to", subject, text, html, attempts`,
    [s.leaseSeconds, limit],
  )) as { rows: OutboxRow[] };
  let sent = 0;
  let failed = 0;
  for (const row of rows) {
    try {
      await transport.send({ to: row.to, subject: row.subject, text: row.text, html: row.html ?? undefined });
      // The body goes once sent: it may hold a one-time link (reset, invitation) that the
      // database otherwise keeps only as a hash. Recipient, subject and times stay.
      await db("mail_outbox").where("id", row.id).update({ sent_at: db.fn.now(), next_attempt_at: null, last_error: null, text: "", html: null });
      sent++;
    } catch (err) {
      failed++;
      const giveUp = row.attempts >= s.maxAttempts;
      await db("mail_outbox")
        .where("id", row.id)
        .update({
          last_error: (err instanceof Error ? err.message : String(err)).slice(0, 1000),
          next_attempt_at: giveUp ? null : db.raw(`now() + make_interval(secs => ?)`, [retryDelaySeconds(row.attempts, s)]),
        });
    }
  }
  return { sent, failed };
}

export interface MailSender {
  /** Runs one delivery pass now (also what the timer does). */
  runOnce(): Promise<void>;
  stop(): Promise<void>;
}

/** Starts the periodic sender; a database or SMTP outage is logged once and retried. */
export function startMailSender(db: Db, transport: Mailer, s: OutboxSettings, log: (e: unknown) => void): MailSender {
  let running: Promise<void> | undefined;
  let again = false;
  let stopped = false;
  let failing = false;
  const pass = async () => {
    do {
      again = false;
      try {
        // Keep going while a full batch came back: there may be more due.
        while (!stopped) {
          const r = await deliverDueMail(db, transport, s);
          if (r.sent + r.failed < 20) break;
        }
        failing = false;
      } catch (err) {
        if (!failing) log(err);
        failing = true;
      }
    } while (again && !stopped);
  };
  const runOnce = () => {
    if (stopped) return Promise.resolve();
    if (running) {
      again = true;
      return running;
    }
    running = pass().finally(() => (running = undefined));
    return running;
  };
  const wake = () => void runOnce();
  wakers.add(wake);
  const timer = setInterval(wake, s.pollMs);
  timer.unref();
  return {
    runOnce,
    async stop() {
      stopped = true;
      wakers.delete(wake);
      clearInterval(timer);
      await running;
    },
  };
}
