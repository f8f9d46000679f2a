// A double read that disagrees, end to end: the QA lead reads every exam twice for this test,
// a sonographer submits a clinical eFAST exam (all findings negative) through the API, two
// reviewers read it (quality 4 and quality 1 with free fluid called positive). In the
// browser the QA lead sees both reads side by side with the differences marked, sets the
// final result keeping the positive finding, finds the follow-up for a possible callback and
// updates it; the sonographer then reads the feedback and acknowledges it.
import fs from "node:fs";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, claimExam, PASSWORD, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const SONOGRAPHER = "sonographer@cedarhollow.example";
const REVIEWER = "reviewer@cedarhollow.example";
const SECOND_REVIEWER = "elias.brunnhold@cedarhollow.example";
const POSITIVE_FINDING = "free_fluid_ruq";

type Criterion = { key: string; kind: string; levels: { value: string; ideal: boolean }[] };
type Workspace = { assignment: { id: string }; exam: { id: string }; rubric: { criteria: Criterion[] } };

async function signIn(browser: Browser, email: string): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  return page;
}

function scoresFor(ws: Workspace, quality: string): Record<string, string> {
  const scores: Record<string, string> = {};
  for (const c of ws.rubric.criteria) scores[c.key] = (c.levels.find((l) => l.ideal) ?? c.levels[0]).value;
  scores.quality = quality;
  return scores;
}

test("a disagreeing double read is adjudicated, followed up and its feedback acknowledged", async ({ browser, baseURL }, testInfo) => {
  test.setTimeout(60_000);
  const base = baseURL!;
  const lead = await apiAs(base, LEAD);
  const sonographer = await apiAs(base, SONOGRAPHER);
  const reviewer = await apiAs(base, REVIEWER);
  const secondReviewer = await apiAs(base, SECOND_REVIEWER);
  const dir = fixtureDir();

  try {
    expect((await lead.patch("/api/settings", { data: { doubleReadShare: 1 } })).ok()).toBeTruthy();

    // The sonographer's clinical eFAST exam, every finding read negative, with one clip.
    const { applications } = (await (await sonographer.get("/api/applications")).json()) as { applications: { code: string; findings: { key: string }[] }[] };
    const efast = applications.find((a) => a.code === "efast")!;
    const performedAt = new Date(Date.now() - 60 * 60_000).toISOString();
    const created = await sonographer.post("/api/exams", {
      data: {
        applicationCode: "efast",
        performedAt,
        setting: "clinical",
        transducer: "curvilinear",
        preset: "Abdomen",
        indication: "Blunt trauma, haemodynamically stable",
        findings: efast.findings.map((f) => ({ key: f.key, read: "negative" })),
        encounterRef: "ENC-2026-004471",
      },
    });
    expect(created.status()).toBe(201);
    const { exam } = (await created.json()) as { exam: { id: string; code: string } };
    const clip = h264Mp4(dir, "ruq-sweep.mp4", { seconds: 1, seed: 5 });
    const upload = await sonographer.post(`/api/exams/${exam.id}/clips`, {
      multipart: { view: "ruq", file: { name: "ruq-sweep.mp4", mimeType: "video/mp4", buffer: fs.readFileSync(clip) } },
    });
    expect(upload.status()).toBe(202);
    await expect
      .poll(
        async () => {
          const body = (await (await sonographer.get(`/api/exams/${exam.id}`)).json()) as { exam: { clips: { state: string }[] } };
          return body.exam.clips.map((c) => c.state).join(",");
        },
        { timeout: 30_000 },
      )
      .toBe("ready");
    expect((await sonographer.post(`/api/exams/${exam.id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBeTruthy();

    // Two independent reads that disagree on quality and on free fluid.
    const first = await claimExam<Workspace>(reviewer, exam.id);
    const negativeReads = efast.findings.map((f) => ({ key: f.key, read: "negative" }));
    const r1 = await reviewer.post(`/api/assignments/${first.assignment.id}/review`, {
      data: { scores: scoresFor(first, "4"), reads: negativeReads, feedback: "Clean views of every window; well done." },
    });
    expect(r1.status(), await r1.text()).toBe(201);
    const second = await claimExam<Workspace>(secondReviewer, exam.id);
    const r2 = await secondReviewer.post(`/api/assignments/${second.assignment.id}/review`, {
      data: {
        scores: scoresFor(second, "1"),
        reads: efast.findings.map((f) => ({ key: f.key, read: f.key === POSITIVE_FINDING ? "positive" : "negative" })),
        feedback: "I think there is a thin stripe of fluid in Morison's pouch.",
        // Flagged at once: the follow-up opens now, before the adjudication.
        urgent: { reason: "Possible free fluid in Morison's pouch on a clinical exam" },
      },
    });
    expect(r2.status(), await r2.text()).toBe(201);

    // The QA lead compares both reads and sets the final result.
    const page = await signIn(browser, LEAD);
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.getByRole("link", { name: "Adjudication" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Adjudication" })).toBeVisible();
    await page.getByRole("link", { name: exam.code }).click();
    await expect(page.getByRole("heading", { level: 1, name: `Exam ${exam.code}` })).toBeVisible();
    // Which read is the primary depends on who claimed first; both readers are named.
    await expect(page.getByRole("columnheader", { name: /^(Primary|Second) · Imani Lindqvist$/ })).toBeVisible();
    await expect(page.getByRole("columnheader", { name: /^(Primary|Second) · Elias Brunnhold$/ })).toBeVisible();
    const qualityRow = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: /Overall image quality/ }) });
    await expect(qualityRow).toContainText("Differs");
    await expect(qualityRow).toContainText("4");
    await expect(qualityRow).toContainText("1");
    const fluidRow = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: "Free fluid, right upper quadrant" }) });
    await expect(fluidRow).toContainText("Differs");
    const depthRow = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: "Depth" }) });
    await expect(depthRow).toContainText("Agrees");
    await expect(page.getByRole("link", { name: /Watch the clips/ })).toHaveAttribute("href", `/exams/${exam.id}`);
    // Prefilled from the primary read; the lead settles quality at 3 and keeps the fluid.
    await expect(page.getByLabel("Final Overall image quality")).toHaveValue(/^[14]$/);
    await page.getByLabel("Final Overall image quality").selectOption("3");
    await page.getByLabel("Final read of Free fluid, right upper quadrant").selectOption("positive");
    await page.getByLabel("Adjudication note").fill("A thin stripe of fluid is visible in the right upper quadrant on the second half of the clip.");
    await shot(page, testInfo, "oversight-adjudication");
    await page.getByRole("button", { name: "Set the final result" }).click();
    await expect(page.getByText(`Final result set for ${exam.code}`)).toBeVisible();
    await expect(page.getByText("A clinically significant disagreement was added to Follow-ups.")).toBeVisible();
    await expect(page.getByRole("link", { name: exam.code })).toHaveCount(0);

    // The possibly missed fluid on a clinical exam waits in Follow-ups.
    await nav.getByRole("link", { name: "Follow-ups" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Follow-ups" })).toBeVisible();
    const followUp = page.getByRole("row").filter({ has: page.getByRole("link", { name: exam.code }) });
    await expect(followUp).toContainText("Open");
    await expect(followUp).toContainText("Urgent");
    await expect(followUp).toContainText("Flagged while scoring as needing clinical follow-up now");
    // The reason names the finding by its label (shared/catalogue.ts), not its key.
    await expect(followUp).toContainText("Free fluid, right upper quadrant");
    await followUp.getByRole("button", { name: `Update follow-up on ${exam.code}` }).click();
    const dialog = page.getByRole("dialog", { name: `Follow-up on ${exam.code}` });
    await dialog.getByRole("radio", { name: "In progress" }).check();
    await dialog.getByLabel("Note").fill("Calling the patient back for a repeat scan.");
    await dialog.getByRole("button", { name: "Save" }).click();
    await expect(followUp).toContainText("In progress");
    await expect(followUp).toContainText("Calling the patient back");
    await shot(page, testInfo, "oversight-follow-ups");
    await page.getByLabel("Status").selectOption("closed");
    await expect(page.getByText("No closed follow-ups")).toBeVisible();
    await page.getByLabel("Status").selectOption("all");

    // Closing asks for the outcome, and this outcome for a note. The encounter reference opens on request.
    await followUp.getByRole("button", { name: `Update follow-up on ${exam.code}` }).click();
    await expect(dialog.getByText("ENC-2026-004471")).toHaveCount(0);
    await dialog.getByRole("button", { name: "Show encounter reference" }).click();
    await expect(dialog.locator("output")).toHaveText("ENC-2026-004471");
    await dialog.getByRole("radio", { name: "Closed" }).check();
    await dialog.getByLabel("Note").fill("");
    await dialog.getByRole("button", { name: "Save" }).click();
    await expect(dialog.getByText("Choose the outcome to close this follow-up")).toBeVisible();
    await dialog.getByLabel("Outcome").selectOption({ label: "Unable to contact" });
    await dialog.getByRole("button", { name: "Save" }).click();
    await expect(dialog.getByText('Write a note: "Unable to contact" needs one')).toBeVisible();
    await dialog.getByLabel("Who acted").fill("Night registrar");
    await dialog.getByLabel(/^Note/).fill("Three calls, no answer; letter sent to the address on file.");
    await dialog.getByRole("button", { name: "Save" }).click();
    await expect(dialog).toBeHidden();
    await expect(followUp).toContainText("Closed");
    await expect(followUp).toContainText("Unable to contact");
    await expect(followUp).toContainText("by Night registrar");
    await shot(page, testInfo, "oversight-follow-up-closed");

    // The sonographer is told, reads the feedback and acknowledges it.
    const learner = await signIn(browser, SONOGRAPHER);
    await expect(learner.getByRole("button", { name: /Notifications, [1-9]\d* unread/ })).toBeVisible();
    await learner.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Feedback" }).click();
    const row = learner.getByRole("row").filter({ has: learner.getByRole("link", { name: exam.code }) });
    await expect(row).toContainText("Unread");
    await expect(row).toContainText("No credit");
    await row.getByRole("link", { name: exam.code }).click();
    await expect(learner.getByRole("heading", { level: 1, name: exam.code })).toBeVisible();
    const main = learner.getByRole("main");
    await expect(main.getByText("Two reads that differed, settled by adjudication")).toBeVisible();
    await expect(main.getByText("No, this exam does not count")).toBeVisible();
    await expect(main.getByText("The minimum for a decision, with clear flaws.")).toBeVisible();
    await expect(main.getByRole("row", { name: /Free fluid, right upper quadrant/ })).toContainText("Differs · False negative");
    await expect(main.getByText("Clean views of every window; well done.")).toBeVisible();
    await expect(main.getByText("A thin stripe of fluid is visible in the right upper quadrant")).toBeVisible();
    await main.getByRole("button", { name: "Acknowledge" }).click();
    await expect(main.getByText(/^Acknowledged /)).toBeVisible();
    await main.getByLabel("Ask a question about this feedback").fill("Which part of the clip shows the fluid?");
    await main.getByRole("button", { name: "Send question" }).click();
    await expect(main.getByText("Which part of the clip shows the fluid?")).toBeVisible();
    await shot(learner, testInfo, "oversight-feedback");
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: 0.2 } });
    await Promise.all([lead.dispose(), sonographer.dispose(), reviewer.dispose(), secondReviewer.dispose()]);
    fs.rmSync(dir, { recursive: true, force: true });
  }
});
