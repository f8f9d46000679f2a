// A large invented program for benchmarks: 50,000 double-read exams (100,000 reviews) with
// random scores, written set-based with generate_series so seeding takes seconds.
import type { Db } from "../server/db/knex";
import { insertCatalogue } from "../server/repositories/applications";
import { ensureDefaultRubric } from "../server/repositories/rubrics";
import { DEFAULT_CATALOGUE } from "../shared/catalogue";

/** Seeds the bench program (once); returns its id. */
export async function seedBench(db: Db, exams = 50_000): Promise<string> {
  const existing = await db("programs").where("slug", "bench-program").first("id");
  if (existing) return existing.id;
  return db.transaction(async (trx) => {
    const [program] = await trx("programs").insert({ name: "Bench Program", slug: "bench-program" }).returning("id");
    await insertCatalogue(trx, program.id, DEFAULT_CATALOGUE);
    await ensureDefaultRubric(trx, program.id);
    const rubric = await trx("rubrics").where({ program_id: program.id, status: "published" }).first("id");
    const [sono] = await trx("users").insert({ email: "bench-sonographer@bench.example", name: "Bench Sonographer" }).returning("id");
    await trx("memberships").insert({ user_id: sono.id, program_id: program.id, roles: ["sonographer"] });
    const reviewers = await trx("users")
      .insert(Array.from({ length: 12 }, (_, i) => ({ email: `bench-reviewer-${i}@bench.example`, name: `Bench Reviewer ${i}` })))
      .returning("id");
    await trx("memberships").insert(reviewers.map((r) => ({ user_id: r.id, program_id: program.id, roles: ["reviewer"] })));
    const ids = reviewers.map((r) => r.id);
    const p = { pid: program.id, sono: sono.id, rubric: rubric.id, n: exams };
    await trx.raw(
      `INSERT INTO exams (program_id, sonographer_id, application_id, code, performed_at, setting, transducer, status, submitted_at, attested_at, double_read)
       SELECT :pid, :sono, (SELECT id FROM applications WHERE program_id = :pid ORDER BY position OFFSET (g % 11) LIMIT 1),
              'EX-BENCH' || g, now() - (g % 365) * interval '1 day', (ARRAY['clinical','educational'])[1 + g % 2], 'curvilinear', 'reviewed',
              now() - (g % 365) * interval '1 day' + interval '1 hour', now() - (g % 365) * interval '1 day' + interval '1 hour', true
       FROM generate_series(1, :n) g`,
      p,
    );
    // Two reads per exam by two different reviewers; quality and depth vary, reviewers sometimes disagree.
    await trx.raw(
      `INSERT INTO assignments (program_id, exam_id, kind, state, reviewer_id, rubric_id, due_at, submitted_at)
       SELECT e.program_id, e.id, k.kind, 'submitted', (:ids::uuid[])[1 + ((row_number() OVER ()) + k.shift) % :nr], :rubric, e.submitted_at, e.submitted_at + interval '1 day'
       FROM exams e CROSS JOIN (VALUES ('primary', 0), ('second', 5)) AS k(kind, shift) WHERE e.program_id = :pid`,
      { ...p, ids, nr: ids.length },
    );
    await trx.raw(
      `INSERT INTO reviews (program_id, assignment_id, exam_id, reviewer_id, rubric_id, scores, reads, credit, submitted_at, time_spent_seconds)
       SELECT a.program_id, a.id, a.exam_id, a.reviewer_id, a.rubric_id,
              jsonb_build_object('transducer', 'suitable', 'marker', 'follows', 'gain', 'balanced', 'plane', 'standard', 'labels', 'complete',
                'depth', (ARRAY['too_shallow','fits','fits','fits','too_deep'])[1 + floor(random() * 5)::int],
                'quality', (2 + floor(random() * 4))::text),
              '[]'::jsonb, true, a.submitted_at, 60 + floor(random() * 300)::int
       FROM assignments a WHERE a.program_id = :pid`,
      p,
    );
    return program.id as string;
  });
}
