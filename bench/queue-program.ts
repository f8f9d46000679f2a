// The set-up the queue and load benchmarks share: an invented program with one application
// (aorta), one sonographer, N reviewers with session tokens, and M submitted exams waiting in
// the review queue. Not a benchmark itself (run.ts picks only *.bench.ts).
import type { Db } from "../server/db/knex";
import { insertCatalogue } from "../server/repositories/applications";
import { ensureDefaultRubric } from "../server/repositories/rubrics";
import { createSession } from "../server/repositories/sessions";
import { signSessionToken } from "../server/auth/tokens";
import { queueSubmittedExam } from "../server/services/queue";
import { DEFAULT_CATALOGUE } from "../shared/catalogue";

/** Seeds the program; `tag` keeps names, e-mail addresses and exam codes apart per benchmark. */
export async function seedQueueProgram(
  db: Db,
  jwtSecret: string,
  opts: { tag: string; reviewers: number; exams: number; setting: (i: number) => "clinical" | "educational" },
) {
  const [program] = await db("programs")
    .insert({ name: `${opts.tag} Bench Program`, slug: `${opts.tag.toLowerCase()}-bench` })
    .returning("id");
  await insertCatalogue(
    db,
    program.id,
    DEFAULT_CATALOGUE.filter((a) => a.code === "aorta"),
  );
  await db.transaction((trx) => ensureDefaultRubric(trx, program.id));
  const app = await db("applications").where("program_id", program.id).first("id");
  const token = async (userId: string) => {
    const sid = await createSession(db, { userId, programId: program.id, ttlSeconds: 3600 });
    return signSessionToken(jwtSecret, { sub: userId, sid, pid: program.id }, 3600);
  };
  const slug = opts.tag.toLowerCase();
  const [sono] = await db("users")
    .insert({ email: `${slug}-sono@bench.example`, name: `${opts.tag} Sonographer` })
    .returning("id");
  await db("memberships").insert({ user_id: sono.id, program_id: program.id, roles: ["sonographer"] });
  const reviewerTokens: string[] = [];
  for (let i = 0; i < opts.reviewers; i++) {
    const [u] = await db("users")
      .insert({ email: `${slug}-reviewer-${i}@bench.example`, name: `${opts.tag} Reviewer ${i}` })
      .returning("id");
    await db("memberships").insert({ user_id: u.id, program_id: program.id, roles: ["reviewer"] });
    reviewerTokens.push(await token(u.id));
  }
  const exams: { id: string; setting: string }[] = await db("exams")
    .insert(
      Array.from({ length: opts.exams }, (_, i) => ({
        program_id: program.id,
        sonographer_id: sono.id,
        application_id: app.id,
        code: `EX-${opts.tag.slice(0, 1).toUpperCase()}${i}`,
        performed_at: new Date(),
        setting: opts.setting(i),
        transducer: "curvilinear",
        status: "submitted",
        submitted_at: new Date(),
        attested_at: new Date(),
      })),
    )
    .returning(["id", "setting"]);
  await db("exam_findings").insert(exams.map((e) => ({ exam_id: e.id, finding_key: "aneurysm", read: "negative" })));
  await db.transaction(async (trx) => {
    for (const e of exams) await queueSubmittedExam(trx, { id: e.id, program_id: program.id, setting: e.setting }, 0);
  });
  return { programId: program.id as string, sonographerId: sono.id as string, sonographerToken: await token(sono.id), reviewerTokens, exams };
}
