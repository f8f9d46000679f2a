// The reviewer's side of the sonographer's questions: one exam as its reviewer read it
// (blinded: never the sonographer), and the list of question threads on exams the caller
// reviewed (a QA lead: every exam of the program). Answers go through POST /exams/:id/messages.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { notFound } from "../../http/errors";
import { DECIDING_READS, examAccess, reviewerReads } from "../../policies/exam";
import { idParamsSchema } from "../../../shared/schemas/common";
import { criteriaFor } from "../../../shared/rubric/logic";
import { getRubric } from "../../repositories/rubrics";
import type { AuthUser } from "../../auth/types";

const isLead = (user: AuthUser) => user.roles.includes("qa_lead");

export function registerQuestionRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/reviews/questions",
    summary: "Question threads on exams I reviewed (QA lead: every exam of the program), newest message first",
    tag: "feedback",
    access: ["reviewer", "qa_lead"],
    responses: { 200: { description: "Threads" } },
    handler: async ({ user }) => {
      const threads = db("feedback_messages")
        .where("program_id", user.programId)
        .groupBy("exam_id")
        .select("exam_id")
        .count("* as n")
        .max("created_at as last_at")
        .as("t");
      const q = db("exams as e")
        .join("applications as ap", "ap.id", "e.application_id")
        .join(threads, "t.exam_id", "e.id")
        .where("e.program_id", user.programId)
        .orderBy("t.last_at", "desc")
        .limit(200)
        .select(
          "e.id",
          "e.code",
          "ap.code as app_code",
          "ap.name as app_name",
          "t.n",
          "t.last_at",
          // Compared in SQL so the sonographer's id never leaves the database.
          db.raw(
            `(SELECT lm.author_id = e.sonographer_id FROM feedback_messages lm WHERE lm.exam_id = e.id
              ORDER BY lm.created_at DESC, lm.id DESC LIMIT 1) AS last_from_sonographer`,
          ),
        );
      if (!isLead(user)) q.whereExists(reviewerReads(db, user.id, "thread", db.ref("e.id")));
      const rows = await q;
      return {
        items: rows.map((r) => ({
          examId: r.id,
          code: r.code,
          application: { code: r.app_code, name: r.app_name },
          lastMessageAt: new Date(r.last_at).toISOString(),
          lastFromSonographer: r.last_from_sonographer === true,
          messages: Number(r.n),
        })),
      };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/reviews/exams/:id",
    summary: "An exam I reviewed, blinded, with my review and the final result (marks my question notifications for it read)",
    tag: "feedback",
    access: ["reviewer", "qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "The exam and my review" }, 404: { description: "Not an exam you reviewed (or, for a QA lead, not of this program)" } },
    handler: async ({ user, params }) => {
      const exam = await db("exams as e")
        .join("applications as ap", "ap.id", "e.application_id")
        .where({ "e.id": params.id, "e.program_id": user.programId })
        .first(
          "e.id",
          "e.program_id",
          "e.sonographer_id",
          "e.code",
          "e.application_id",
          "e.performed_at",
          "e.setting",
          "e.status",
          "ap.code as app_code",
          "ap.name as app_name",
        );
      // 404 rather than 403, as in policies/exam.ts: an id of an exam you did not read reveals nothing.
      // A calibration read alone gives no access: the final result is not its reader's to see.
      const access = await examAccess(db, user, exam, "thread");
      if (!exam || (access !== "reviewer" && access !== "lead")) throw notFound("Exam");
      const review = await db("reviews as v")
        .join("assignments as va", "va.id", "v.assignment_id")
        .where({ "v.exam_id": exam.id, "v.reviewer_id": user.id, "v.program_id": user.programId })
        .whereIn("va.kind", DECIDING_READS)
        .orderBy("v.submitted_at", "desc")
        .first("v.*");

      const [rubric, findings, result] = await Promise.all([
        review ? getRubric(db, user.programId, review.rubric_id) : Promise.resolve(undefined),
        db("application_findings").where("application_id", exam.application_id).orderBy("position").select("key", "label"),
        db("exam_results").where({ exam_id: exam.id, program_id: user.programId }).first("credit", "source", "decided_at"),
      ]);
      await db("notifications").where({ user_id: user.id, exam_id: exam.id, kind: "feedback_reply" }).whereNull("read_at").update({ read_at: db.fn.now() });

      let myReview = null;
      if (review) {
        const scores = (review.scores ?? {}) as Record<string, string | number>;
        const criteria = rubric
          ? criteriaFor(rubric.criteria, exam.app_code).map((c) => {
              const value = scores[c.key] ?? null;
              const level = value === null ? undefined : c.levels.find((l) => l.value === String(value));
              return { key: c.key, label: c.label, value, levelLabel: level?.label ?? null };
            })
          : [];
        const labels = new Map(findings.map((f) => [f.key as string, f.label as string]));
        const position = new Map(findings.map((f, i) => [f.key as string, i]));
        const reads = ((review.reads ?? []) as { key: string; read: string }[])
          .map((r) => ({ key: r.key, label: labels.get(r.key) ?? r.key, read: r.read }))
          .sort((a, b) => (position.get(a.key) ?? 999) - (position.get(b.key) ?? 999));
        myReview = { submittedAt: review.submitted_at.toISOString(), feedback: review.feedback, criteria, reads };
      }
      return {
        exam: {
          id: exam.id,
          code: exam.code,
          application: { code: exam.app_code, name: exam.app_name },
          performedAt: exam.performed_at.toISOString(),
          setting: exam.setting,
          status: exam.status,
        },
        myReview,
        final: result ? { credit: result.credit, source: result.source, decidedAt: result.decided_at.toISOString() } : null,
      };
    },
  });
}
