// The reviewer's side of the sonographer's questions: the list of question threads on exams
// the caller reviewed (a QA lead: every exam of the program), and one exam as its reviewer
// read it (blinded: never the sonographer). Answers go through POST /exams/:id/messages.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { idParamsSchema, questionThreadListSchema, reviewedExamSchema } from "./schema";
import { questionThreadsFor, reviewedExam } from "../../services/reviewed-exams";
import { presentQuestionThread, presentReviewedExam } from "../../presenters/reviewing";

export function registerReviewRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/reviews/questions",
    summary: "Question threads on exams I reviewed (QA lead: every exam of the program), newest message first",
    tag: "feedback",
    access: ["reviewer", "qa_lead"],
    responses: { 200: { description: "Threads", schema: questionThreadListSchema } },
    handler: async ({ user }) => ({ items: (await questionThreadsFor(db, user)).map(presentQuestionThread) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/reviews/exams/:id",
    summary: "An exam I reviewed, blinded, with my review and the final result (marks my question notifications for it read)",
    tag: "feedback",
    access: ["reviewer", "qa_lead"],
    params: idParamsSchema,
    responses: {
      200: { description: "The exam and my review", schema: reviewedExamSchema },
      404: { description: "Not an exam you reviewed (or, for a QA lead, not of this program)" },
    },
    handler: async ({ user, params }) => presentReviewedExam(await reviewedExam(db, user, params.id)),
  });
}
