// A reviewer scores an exam with the keyboard alone, and the sonographer then reads the
// feedback. Set-up goes through the API: the QA lead turns double reads off (one read settles
// the exam), the sonographer submits an eFAST exam with one clip. In the browser the reviewer
// opens the Queue, starts the next exam with N, picks a level for every criterion with digits
// and Tab/Enter, reads every finding with P/N/I, types feedback and submits with Ctrl+Enter.
import fs from "node:fs";
import { expect, test, type APIRequestContext, type Page } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const REVIEWER = "reviewer@cedarhollow.example";
const SONOGRAPHER = "sonographer@cedarhollow.example";
// Wide enough for the workspace's two columns, tall enough to see the clip and most of the rubric.
test.use({ viewport: { width: 1440, height: 900 } });

const FEEDBACK = "Fan through the whole pelvis before you freeze; the depth was set well.";

async function signIn(page: Page, email: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByLabel("Password").press("Enter");
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
}

/** The sonographer's eFAST exam with one processed clip, submitted for review; returns its id and code. */
async function submitEfastExam(sono: APIRequestContext): Promise<{ id: string; code: string }> {
  const apps = await (await sono.get("/api/applications")).json();
  const efast = apps.applications.find((a: { code: string }) => a.code === "efast");
  expect(efast, "the eFAST application").toBeTruthy();
  const created = await sono.post("/api/exams", {
    data: {
      applicationCode: "efast",
      performedAt: new Date(Date.now() - 20 * 60_000).toISOString(),
      setting: "clinical",
      transducer: "curvilinear",
      preset: "Abdomen",
      indication: "Fall from standing height",
      findings: efast.findings.map((f: { key: string }) => ({ key: f.key, read: "negative" })),
    },
  });
  expect(created.status()).toBe(201);
  const { exam } = await created.json();

  const file = h264Mp4(fixtureDir(), "ruq-sweep.mp4", { seconds: 2, seed: 41 });
  const upload = await sono.post(`/api/exams/${exam.id}/clips`, {
    multipart: { file: { name: "ruq-sweep.mp4", mimeType: "video/mp4", buffer: fs.readFileSync(file) }, view: efast.views[0].key },
  });
  expect(upload.status()).toBe(202);
  await expect
    .poll(async () => (await (await sono.get(`/api/exams/${exam.id}`)).json()).exam.clips.map((c: { state: string }) => c.state).join(","), { timeout: 30_000 })
    .toBe("ready");

  const submitted = await sono.post(`/api/exams/${exam.id}/submit`, { data: { attestNoIdentifiers: true } });
  expect(submitted.ok()).toBe(true);
  return { id: exam.id, code: exam.code };
}

test("a reviewer scores an exam with the keyboard alone and the sonographer reads the feedback", async ({ page, baseURL }, testInfo) => {
  test.setTimeout(60_000);
  const lead = await apiAs(baseURL!, LEAD);
  const before = (await (await lead.get("/api/settings")).json()).settings.doubleReadShare;
  expect((await lead.patch("/api/settings", { data: { doubleReadShare: 0 } })).ok()).toBe(true);

  try {
    const sono = await apiAs(baseURL!, SONOGRAPHER);
    const exam = await submitEfastExam(sono);

    // The reviewer: sign in, open the Queue filtered to eFAST (other tests may leave other exams waiting).
    await signIn(page, REVIEWER);
    await page.goto("/queue?application=efast");
    await expect(page.getByRole("heading", { level: 1, name: "Queue" })).toBeVisible();
    await expect(page.getByRole("cell", { name: "Clinical" })).toBeVisible();

    // From here on, the keyboard alone.
    await page.keyboard.press("n");
    await expect(page).toHaveURL(/\/queue\/[0-9a-f-]{36}\?application=efast$/);
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(`Exam ${exam.code}`);
    await expect(page.getByText("Blinded", { exact: true })).toBeVisible();
    const video = page.locator("video");
    await expect(video).toHaveAttribute("loop", "");
    // → steps a frame (and pauses) even while a level radio has focus; the level stays unpicked.
    await page.keyboard.press("ArrowRight");
    await expect.poll(() => video.evaluate((v: HTMLVideoElement) => v.paused)).toBe(true);
    await expect(page.getByText(/frame \d+ \/ \d+/)).toBeVisible();

    const rubric = page.getByRole("region", { name: /General image review/ });
    const criteria = rubric.getByRole("radiogroup");
    const criterionCount = await criteria.count();
    expect(criterionCount).toBeGreaterThan(3);
    // The first criterion has focus: a digit picks its level, then Tab or Enter moves on.
    for (let i = 0; i < criterionCount; i++) {
      const digit = i % 2 === 0 ? "1" : "2";
      await page.keyboard.press(digit);
      await expect(
        criteria
          .nth(i)
          .getByRole("radio")
          .nth(Number(digit) - 1),
      ).toBeChecked();
      await page.keyboard.press(i % 2 === 0 ? "Tab" : "Enter");
    }
    await expect(rubric.getByText("All required scored")).toBeVisible();

    const findings = page.getByRole("region", { name: "Your read of each finding" }).getByRole("radiogroup");
    const findingCount = await findings.count();
    expect(findingCount).toBeGreaterThan(0);
    for (let i = 0; i < findingCount; i++) {
      await page.keyboard.press(i === 0 ? "p" : "n");
      await expect(findings.nth(i).getByRole("radio", { name: i === 0 ? "Positive" : "Negative" })).toBeChecked();
      await page.keyboard.press("Tab");
    }
    await expect(page.getByRole("textbox", { name: "Feedback to the clinician" })).toBeFocused();
    await page.keyboard.type(FEEDBACK);
    await expect(page.getByRole("status").filter({ hasText: /^Saved \d/ })).toBeVisible({ timeout: 10_000 });
    await page.evaluate(() => window.scrollTo(0, 0));
    await shot(page, testInfo, "scoring-workspace", false);

    await page.keyboard.press("Control+Enter");
    await expect(page).toHaveURL(/\/queue\?application=efast$/);
    await expect(page.getByText(/All done/)).toBeVisible();
    await expect(page.getByText("Nothing is waiting for you")).toBeVisible();

    // The sonographer reads the feedback.
    await page.context().clearCookies();
    await signIn(page, SONOGRAPHER);
    await page.goto(`/feedback/${exam.id}`);
    await expect(page.getByRole("heading", { level: 1, name: exam.code })).toBeVisible();
    await expect(page.getByText(FEEDBACK)).toBeVisible();
    const transducer = page.getByRole("listitem").filter({ has: page.getByRole("heading", { name: "Transducer and preset" }) });
    await expect(transducer.getByText("Suitable", { exact: true })).toBeVisible();
    await shot(page, testInfo, "scoring-feedback");
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: before } });
  }
});
