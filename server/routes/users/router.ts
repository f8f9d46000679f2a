// Setup → People: members, invitations, roles, deactivation. Every query is scoped to the
// caller's program; another program's user answers 404.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import {
  idParamsSchema,
  invitationAnswerSchema,
  invitationListSchema,
  inviteSchema,
  memberAnswerSchema,
  memberListSchema,
  operatorNamesSchema,
  updateRolesSchema,
} from "./schema";
import { actorOf } from "../../services/actor";
import { invite, programInvitations, withdrawInvitation } from "../../services/invitations";
import { changeOperatorNames, changeRoles, programMembers, setMemberActive } from "../../services/members";
import { presentInvitation } from "../../presenters/invitation";
import { presentMember } from "../../presenters/member";

export function registerUserRoutes(kit: RouteKit, { db, config }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/users",
    summary: "Members of the program",
    tag: "people",
    access: ["admin", "qa_lead"],
    responses: { 200: { description: "Members", schema: memberListSchema } },
    handler: async ({ user }) => ({ members: (await programMembers(db, user.programId)).map(presentMember) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/users/invitations",
    summary: "Invitations of the program, newest first",
    tag: "people",
    access: ["admin"],
    responses: { 200: { description: "Invitations", schema: invitationListSchema } },
    handler: async ({ user }) => ({ invitations: (await programInvitations(db, user.programId)).map(presentInvitation) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/users/invitations",
    summary: "Invite someone by e-mail; a one-time link lets them set a password and join",
    tag: "people",
    access: ["admin"],
    body: inviteSchema,
    responses: { 201: { description: "Invited", schema: invitationAnswerSchema }, 409: { description: "Already a member" } },
    handler: async ({ req, res, user, body }) => {
      const invitation = await invite(db, config, { ...actorOf(req, user), name: user.name, programName: user.programName }, body);
      res.status(201);
      return { invitation: presentInvitation(invitation) };
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/users/invitations/:id",
    summary: "Revoke an open invitation",
    tag: "people",
    access: ["admin"],
    params: idParamsSchema,
    responses: { 204: { description: "Revoked" }, 404: { description: "No open invitation with this id in the program" } },
    handler: async ({ req, user, params }) => {
      await withdrawInvitation(db, actorOf(req, user), params.id);
    },
  });

  defineRoute(kit, {
    method: "put",
    path: "/users/:id/roles",
    summary: "Set a member's roles; removing a role signs them out everywhere in this program",
    tag: "people",
    access: ["admin"],
    params: idParamsSchema,
    body: updateRolesSchema,
    responses: {
      200: { description: "Updated", schema: memberAnswerSchema },
      404: { description: "Not a member" },
      409: { description: "Would leave no admin" },
    },
    handler: async ({ req, user, params, body }) => ({ member: presentMember(await changeRoles(db, actorOf(req, user), params.id, body.roles)) }),
  });

  defineRoute(kit, {
    method: "put",
    path: "/users/:id/dicom-operator-names",
    summary: "Set the operator names a member's scans carry in DICOM, so received studies reach their inbox",
    tag: "people",
    access: ["admin", "qa_lead"],
    params: idParamsSchema,
    body: operatorNamesSchema,
    responses: {
      200: { description: "Updated", schema: memberAnswerSchema },
      404: { description: "Not a member" },
      409: { description: "A name is already another member's" },
    },
    handler: async ({ req, user, params, body }) => ({
      member: presentMember(await changeOperatorNames(db, actorOf(req, user), params.id, body.names)),
    }),
  });

  for (const action of ["deactivate", "reactivate"] as const) {
    defineRoute(kit, {
      method: "post",
      path: `/users/:id/${action}`,
      summary: action === "deactivate" ? "Deactivate a member: they can no longer sign in to this program" : "Reactivate a deactivated member",
      tag: "people",
      access: ["admin"],
      params: idParamsSchema,
      responses: {
        200: { description: "Done", schema: memberAnswerSchema },
        404: { description: "Not a member" },
        409: { description: "Not allowed for this member" },
      },
      handler: async ({ req, user, params }) => ({
        member: presentMember(await setMemberActive(db, actorOf(req, user), params.id, action === "reactivate")),
      }),
    });
  }
}
