// Setup → Rubrics: versioned rubrics. Saving a published rubric makes its next version (the
// old one is archived); reviews keep the version they were made under, so editing never
// changes a past score.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { rubricInputSchema, rubricSchema } from "../../../shared/rubric/types";
import { getRubric, insertRubric, listRubrics } from "../../repositories/rubrics";
import { audit } from "../../repositories/audit";

export function registerRubricRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/rubrics",
    summary: "Every rubric version of the program",
    tag: "rubrics",
    access: ["qa_lead", "reviewer"],
    responses: { 200: { description: "Rubric versions" } },
    handler: async ({ user }) => ({ rubrics: await listRubrics(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/rubrics/:id",
    summary: "One rubric version with its criteria",
    tag: "rubrics",
    access: ["qa_lead", "reviewer"],
    params: idParamsSchema,
    responses: { 200: { description: "The rubric", schema: z.object({ rubric: rubricSchema }) } },
    handler: async ({ user, params }) => {
      const rubric = await getRubric(db, user.programId, params.id);
      if (!rubric) throw notFound("Rubric");
      return { rubric };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/rubrics",
    summary: "Start a new rubric (a draft, version 1)",
    tag: "rubrics",
    access: ["qa_lead"],
    body: rubricInputSchema,
    responses: { 201: { description: "Created", schema: z.object({ rubric: rubricSchema }) } },
    handler: async ({ req, res, user, body }) => {
      const id = await db.transaction(async (trx) => {
        const id = await insertRubric(trx, {
          programId: user.programId,
          version: 1,
          name: body.name,
          status: "draft",
          criteria: body.criteria,
          createdBy: user.id,
        });
        await audit(trx, { programId: user.programId, actorUserId: user.id, action: "rubric.created", entityType: "rubric", entityId: id, ip: req.ip });
        return id;
      });
      res.status(201).json({ rubric: await getRubric(db, user.programId, id) });
    },
  });

  defineRoute(kit, {
    method: "put",
    path: "/rubrics/:id",
    summary: "Save a rubric: a draft changes in place; a published one gets a new published version",
    tag: "rubrics",
    access: ["qa_lead"],
    params: idParamsSchema,
    body: rubricInputSchema,
    responses: { 200: { description: "Saved (the id may be a new version's)", schema: z.object({ rubric: rubricSchema }) }, 409: { description: "Archived" } },
    handler: async ({ req, user, params, body }) => {
      const id = await db.transaction(async (trx) => {
        const row = await trx("rubrics").where({ id: params.id, program_id: user.programId }).forUpdate().first();
        if (!row) throw notFound("Rubric");
        if (row.status === "archived") throw new HttpError(409, "rubric_archived", "An archived version cannot change; edit the current version instead");
        if (row.status === "draft") {
          await trx("rubric_criteria").where("rubric_id", row.id).delete();
          await trx("rubrics").where("id", row.id).delete();
          const id = await insertRubric(trx, {
            programId: user.programId,
            familyId: row.family_id,
            version: row.version,
            name: body.name,
            status: "draft",
            criteria: body.criteria,
            createdBy: user.id,
          });
          await audit(trx, { programId: user.programId, actorUserId: user.id, action: "rubric.draft_saved", entityType: "rubric", entityId: id, ip: req.ip });
          return id;
        }
        const [{ max }] = await trx("rubrics").where("family_id", row.family_id).max<{ max: number }[]>("version as max");
        await trx("rubrics").where("id", row.id).update({ status: "archived", archived_at: trx.fn.now() });
        const id = await insertRubric(trx, {
          programId: user.programId,
          familyId: row.family_id,
          version: max + 1,
          name: body.name,
          status: "published",
          criteria: body.criteria,
          createdBy: user.id,
        });
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "rubric.new_version",
          entityType: "rubric",
          entityId: id,
          ip: req.ip,
          details: { from: row.version, to: max + 1 },
        });
        return id;
      });
      return { rubric: await getRubric(db, user.programId, id) };
    },
  });

  for (const action of ["publish", "archive"] as const) {
    defineRoute(kit, {
      method: "post",
      path: `/rubrics/:id/${action}`,
      summary: action === "publish" ? "Publish a draft (the family's published version is archived)" : "Archive a rubric version",
      tag: "rubrics",
      access: ["qa_lead"],
      params: idParamsSchema,
      responses: { 200: { description: "Done", schema: z.object({ rubric: rubricSchema }) } },
      handler: async ({ req, user, params }) => {
        await db.transaction(async (trx) => {
          const row = await trx("rubrics").where({ id: params.id, program_id: user.programId }).forUpdate().first();
          if (!row) throw notFound("Rubric");
          if (action === "publish") {
            if (row.status !== "draft") throw new HttpError(409, "not_draft", "Only a draft can be published");
            await trx("rubrics").where({ family_id: row.family_id, status: "published" }).update({ status: "archived", archived_at: trx.fn.now() });
            await trx("rubrics").where("id", row.id).update({ status: "published", published_at: trx.fn.now() });
          } else {
            if (row.status === "archived") throw new HttpError(409, "already_archived", "This version is already archived");
            await trx("rubrics").where("id", row.id).update({ status: "archived", archived_at: trx.fn.now() });
          }
          await audit(trx, {
            programId: user.programId,
            actorUserId: user.id,
            action: action === "publish" ? "rubric.published" : "rubric.archived",
            entityType: "rubric",
            entityId: row.id,
            ip: req.ip,
          });
        });
        return { rubric: await getRubric(db, user.programId, params.id) };
      },
    });
  }
}
