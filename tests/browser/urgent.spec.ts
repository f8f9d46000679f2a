// The urgent flag in the scoring workspace (issue 14): a reviewer scoring a clinical exam ticks
// "Needs clinical follow-up now"; without a reason the submit is held and the reason field says
// why; with one, the read is sent and the QA lead finds an urgent follow-up, due soon, on
// Follow-ups before any other read. The exam and the reviewer's draft are set up through the API.
import fs from "node:fs";
import { expect, test } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, claimExam, PASSWORD, scores, shot } from "./support";

const SONOGRAPHER = "tobias.varga@cedarhollow.example";
const REVIEWER = "reviewer@cedarhollow.example";
const LEAD = "lead@cedarhollow.example";

type Workspace = { assignment: { id: string }; exam: { id: string; code: string; findings: { key: string }[] } };

test("a reviewer flags a clinical read as needing follow-up now and the QA lead finds it at once", async ({ browser, baseURL }, testInfo) => {
  test.setTimeout(60_000);
  const sonographer = await apiAs(baseURL!, SONOGRAPHER);
  const reviewer = await apiAs(baseURL!, REVIEWER);
  const { applications } = (await (await sonographer.get("/api/applications")).json()) as { applications: { code: string; findings: { key: string }[] }[] };
  const efast = applications.find((a) => a.code === "efast")!;
  const created = await sonographer.post("/api/exams", {
    data: {
      applicationCode: "efast",
      performedAt: new Date(Date.now() - 30 * 60_000).toISOString(),
      setting: "clinical",
      transducer: "curvilinear",
      indication: "Fall from a ladder, abdominal pain",
      findings: efast.findings.map((f) => ({ key: f.key, read: "negative" })),
    },
  });
  const { exam } = (await created.json()) as { exam: { id: string; code: string } };
  const clip = h264Mp4(fixtureDir(), "luq-sweep.mp4", { seconds: 1, seed: 21 });
  await sonographer.post(`/api/exams/${exam.id}/clips`, {
    multipart: { view: "luq", file: { name: "luq-sweep.mp4", mimeType: "video/mp4", buffer: fs.readFileSync(clip) } },
  });
  await expect
    .poll(async () => ((await (await sonographer.get(`/api/exams/${exam.id}`)).json()) as { exam: { clips: { state: string }[] } }).exam.clips[0]?.state, {
      timeout: 30_000,
    })
    .toBe("ready");
  expect((await sonographer.post(`/api/exams/${exam.id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBeTruthy();
  const ws = await claimExam<Workspace>(reviewer, exam.id);
  // The reviewer's scores so far (autosaved), so the browser opens on a complete read.
  const draft = await reviewer.put(`/api/assignments/${ws.assignment.id}/draft`, {
    data: { scores: scores("4"), reads: efast.findings.map((f) => ({ key: f.key, read: f.key === "free_fluid_luq" ? "positive" : "negative" })), feedback: "" },
  });
  expect(draft.ok(), await draft.text()).toBeTruthy();

  const page = await (await browser.newContext()).newPage();
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(REVIEWER);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  await page.goto(`/queue/${ws.assignment.id}`);
  await page.getByRole("checkbox", { name: /Needs clinical follow-up now/ }).check();
  await page.getByRole("button", { name: /Submit and open next/ }).click();
  await expect(page.getByText("Say why this patient needs follow-up now")).toBeVisible();
  await expect(page.getByLabel("Why, in a sentence")).toBeFocused();
  await page.getByLabel("Why, in a sentence").fill("Fluid around the spleen; the clinician read the left upper quadrant as clear");
  await shot(page, testInfo, "urgent-flag");
  await page.getByRole("button", { name: /Submit and open next/ }).click();
  await expect(page).toHaveURL(/\/queue(\/|$|\?)/);

  const lead = await (await browser.newContext()).newPage();
  await lead.goto("/sign-in");
  await lead.getByLabel("E-mail").fill(LEAD);
  await lead.getByLabel("Password").fill(PASSWORD);
  await lead.getByRole("button", { name: "Sign in" }).click();
  await expect(lead.getByRole("button", { name: /Notifications, [1-9]\d* unread/ })).toBeVisible();
  await lead.goto("/oversight/follow-ups");
  const row = lead.getByRole("row").filter({ has: lead.getByRole("link", { name: exam.code }) });
  await expect(row).toContainText("Urgent");
  await expect(row).toContainText("Fluid around the spleen");
  await expect(row).toContainText(/Due /);
});
