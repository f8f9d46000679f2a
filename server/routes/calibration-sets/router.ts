// /calibration-sets: the QA lead sends chosen exams to reviewers as blinded calibration reads
// and reads the results (multi-rater agreement, each reviewer against the reference answers).
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import {
  calibrationResultsSchema,
  calibrationSetCreatedSchema,
  calibrationSetListSchema,
  createCalibrationSetSchema,
  idParamsSchema,
  referenceFormSchema,
} from "./schema";
import { actorOf } from "../../services/actor";
import { calibrationSetResults, calibrationSets, createCalibrationSet, referenceForm } from "../../services/calibration";

export function registerCalibrationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "post",
    path: "/calibration-sets",
    summary: "Send chosen exams to reviewers as blinded calibration reads",
    tag: "calibration",
    access: ["qa_lead"],
    body: createCalibrationSetSchema,
    responses: { 201: { description: "Created", schema: calibrationSetCreatedSchema } },
    handler: async ({ req, res, user, body }) => {
      const id = await createCalibrationSet(db, actorOf(req, user), body);
      res.status(201);
      return { id };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/calibration-sets",
    summary: "Calibration sets with their progress",
    tag: "calibration",
    access: ["qa_lead"],
    responses: { 200: { description: "Sets", schema: calibrationSetListSchema } },
    handler: async ({ user }) => ({ items: await calibrationSets(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/calibration-sets/exams/:id",
    summary: "An exam as the new-set form needs it for a reference answer: its application, the criteria calibration reads would use, its findings",
    tag: "calibration",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: {
      200: { description: "The exam's reference form", schema: referenceFormSchema },
      404: { description: "No submitted exam with this id in the program" },
    },
    handler: ({ user, params }) => referenceForm(db, user.programId, params.id),
  });

  defineRoute(kit, {
    method: "get",
    path: "/calibration-sets/:id/results",
    summary: "Multi-rater agreement per criterion and each reviewer against the reference",
    tag: "calibration",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Results", schema: calibrationResultsSchema } },
    handler: ({ user, params }) => calibrationSetResults(db, user.programId, params.id),
  });
}
