// A sonographer submits an exam with two clips through the browser: the form, uploads with
// progress, processing to ready, posters, view labels, attestation and submission, then My
// exams. Also: a text file named .mp4 is refused with the server's own words.
import fs from "node:fs";
import path from "node:path";
import { expect, test, type Page, type TestInfo } from "@playwright/test";
import { fixtureDir, h264Mp4, textFile } from "../api/media-fixtures";

const PASSWORD = "soundings-demo";
const SONOGRAPHER = "sonographer@cedarhollow.example";

async function signIn(page: Page) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(SONOGRAPHER);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
}

/** A new draft whose exam answer, on its way to the page, lists one clip in the given state. */
async function draftShowingOneClip(page: Page, fields: { applicationCode: string; setting: string; transducer: string }, clip: Record<string, unknown>) {
  const created = await page.request.post("/api/exams", {
    data: { ...fields, performedAt: new Date(Date.now() - 3_600_000).toISOString(), preset: "", indication: "", findings: [] },
  });
  const { exam } = (await created.json()) as { exam: { id: string } };
  await page.route(`**/api/exams/${exam.id}`, async (route) => {
    const response = await route.fetch();
    const body = (await response.json()) as { exam: Record<string, unknown> };
    const shown = {
      kind: "video",
      sizeBytes: 3000,
      width: null,
      height: null,
      seconds: null,
      fps: null,
      frames: null,
      redactions: [],
      precheck: null,
      dicom: null,
      media: { video: null, image: null, poster: null, strip: null, thumb: null },
      createdAt: new Date().toISOString(),
      ...clip,
    };
    await route.fulfill({ response, json: { exam: { ...body.exam, clips: [shown] } } });
  });
  return exam;
}

async function shot(page: Page, testInfo: TestInfo, name: string) {
  const file = path.join(testInfo.project.outputDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  await testInfo.attach(name, { path: file, contentType: "image/png" });
}

/** Fills the details of a focused cardiac exam, reading every finding as negative. */
async function fillCardiacDetails(page: Page) {
  const main = page.getByRole("main");
  await main.getByLabel("Application").selectOption({ label: "Focused cardiac" });
  await expect(main.getByLabel("Performed at")).not.toHaveValue("");
  await main.getByRole("radio", { name: "Educational" }).check();
  await expect(main.getByText("Usual for this application: Phased array.")).toBeVisible();
  await main.getByLabel("Transducer").selectOption("phased");
  await main.getByLabel("Preset").fill("Cardiac");
  await main.getByLabel("Indication").fill("Teaching scan on a volunteer");
  const findings = main.getByRole("group").filter({ has: page.getByRole("radio", { name: "Indeterminate" }) });
  const count = await findings.count();
  expect(count).toBeGreaterThan(0);
  for (let i = 0; i < count; i++) await findings.nth(i).getByRole("radio", { name: "Negative" }).check();
}

test("a sonographer submits an exam with two clips and finds it submitted in My exams", async ({ page }, testInfo) => {
  test.setTimeout(60_000);
  const dir = fixtureDir();
  const first = h264Mp4(dir, "plax-sweep.mp4", { seconds: 2, seed: 11 });
  const second = h264Mp4(dir, "a4c-sweep.mp4", { seconds: 2, seed: 97 });

  await signIn(page);
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Submit" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "New exam" })).toBeVisible();

  // The future is refused next to the field before anything is sent.
  await fillCardiacDetails(page);
  await page.getByLabel("Performed at").fill("2099-01-01T10:00");
  await page.getByRole("button", { name: "Save draft" }).click();
  await expect(page.getByText("The scan cannot be in the future")).toBeVisible();
  const earlier = new Date(Date.now() - 30 * 60_000);
  const local = new Date(earlier.getTime() - earlier.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
  await page.getByLabel("Performed at").fill(local);

  await page.getByRole("button", { name: "Save draft" }).click();
  await expect(page).toHaveURL(/\/exams\/[0-9a-f-]{36}\/edit$/);
  await expect(page.getByText("Draft saved. Now add the clips.")).toBeVisible();
  const submit = page.getByRole("button", { name: "Submit for review" });
  await expect(submit).toBeDisabled();
  await expect(page.getByText("Add at least one clip.")).toBeVisible();

  // Slow the upload down so each file's progress bar can be seen moving.
  const cdp = await page.context().newCDPSession(page);
  await cdp.send("Network.enable");
  await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 150 * 1024 });
  await page.getByLabel("Choose files").setInputFiles([first, second]);
  for (const name of ["plax-sweep.mp4", "a4c-sweep.mp4"]) {
    await expect(page.getByRole("progressbar", { name: `Uploading ${name}` })).toBeVisible();
  }
  await shot(page, testInfo, "exams-uploading");
  await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

  // Each clip goes through processing to ready, and its poster is a real image.
  for (const name of ["plax-sweep.mp4", "a4c-sweep.mp4"]) {
    const row = page.getByRole("listitem", { name: `Clip ${name}` });
    await expect(row).toBeVisible({ timeout: 20_000 });
    await expect(row.getByText("Ready", { exact: true })).toBeVisible({ timeout: 30_000 });
    const poster = row.getByRole("img", { name: `Poster of ${name}` });
    await expect(poster).toBeVisible();
    await expect.poll(() => poster.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth), { timeout: 10_000 }).toBeGreaterThan(0);
  }

  // View labels are saved as they are chosen.
  for (const [name, view] of [
    ["plax-sweep.mp4", "Parasternal long axis"],
    ["a4c-sweep.mp4", "Apical four-chamber"],
  ]) {
    const saved = page.waitForResponse((r) => r.url().includes("/api/clips/") && r.request().method() === "PATCH" && r.ok());
    await page.getByLabel(`View of ${name}`).selectOption({ label: view });
    await saved;
  }

  // Submitting asks for the attestation first.
  await expect(submit).toBeEnabled();
  await submit.click();
  await expect(page.getByText("Confirm that no patient identifiers are visible in any clip")).toBeVisible();
  await page.getByLabel(/No patient identifiers are visible in any clip/).check();
  await shot(page, testInfo, "exams-ready-to-submit");
  await submit.click();

  await expect(page).toHaveURL(/\/exams\/[0-9a-f-]{36}$/);
  await expect(page.getByText("Submitted for review. The exam is now read-only.")).toBeVisible();
  const heading = await page.getByRole("heading", { level: 1 }).textContent();
  const code = heading!.replace(/^Exam /, "").trim();
  const main = page.getByRole("main");
  await expect(main.getByText(/^(Submitted|In review)$/).first()).toBeVisible();
  // The two uploads ran side by side, so either may have arrived first.
  await expect(main.getByRole("heading", { name: /^Clip [12]: Parasternal long axis$/ })).toBeVisible();
  await expect(main.getByRole("heading", { name: /^Clip [12]: Apical four-chamber$/ })).toBeVisible();
  // Read-only: no editing, no view select, no redaction.
  await expect(main.getByRole("link", { name: "Continue editing" })).toHaveCount(0);
  await expect(main.getByRole("combobox")).toHaveCount(0);
  const video = main.locator("video").first();
  await expect(video).toHaveAttribute("loop", "");
  await expect.poll(() => video.evaluate((v: HTMLVideoElement) => v.readyState), { timeout: 10_000 }).toBeGreaterThan(0);
  await shot(page, testInfo, "exams-submitted-exam");

  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "My exams" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "My exams" })).toBeVisible();
  const row = page.getByRole("row").filter({ has: page.getByRole("link", { name: code }) });
  // Submitted exams may enter the review queue at once.
  await expect(row).toContainText(/Submitted|In review/);
  await expect(row).toContainText("Focused cardiac");
  await expect(row).toContainText("2/2 ready");
  await page.getByLabel("Status").selectOption("submitted");
  await expect(page).toHaveURL(/status=submitted/);
  await expect(row).toBeVisible();
  await shot(page, testInfo, "exams-my-exams");

  fs.rmSync(dir, { recursive: true, force: true });
});

test("a text file named .mp4 is refused with the reason from the server", async ({ page }, testInfo) => {
  const dir = fixtureDir();
  const fake = textFile(dir, "not-a-scan.mp4");
  await signIn(page);
  await page.goto("/exams/new");
  await fillCardiacDetails(page);
  // Dropping the first file on a new exam saves the draft by itself, then uploads.
  await page.getByLabel("Choose files").setInputFiles(fake);
  await expect(page).toHaveURL(/\/exams\/[0-9a-f-]{36}\/edit$/);
  const upload = page.getByRole("listitem", { name: "Upload of not-a-scan.mp4" });
  await expect(upload.getByRole("alert")).toContainText(/file: found .+; upload MP4, MOV, M4V, AVI, WebM or MKV video/);
  await expect(upload.getByText("Not uploaded")).toBeVisible();
  await expect(page.getByRole("button", { name: "Submit for review" })).toBeDisabled();
  await shot(page, testInfo, "exams-refused-upload");

  // The home card for drafts leads to My exams filtered to drafts.
  await page.getByRole("link", { name: "Soundings home" }).click();
  await page.getByRole("link", { name: /Drafts not yet submitted/ }).click();
  await expect(page).toHaveURL(/\/exams\?status=draft$/);
  await expect(page.getByLabel("Status")).toHaveValue("draft");
  await expect(page.getByRole("table")).toContainText("Draft");
  fs.rmSync(dir, { recursive: true, force: true });
});

test("on a draft's exam page, a redaction box added by keyboard is saved and the clip reprocessed", async ({ page }, testInfo) => {
  const dir = fixtureDir();
  const clipFile = h264Mp4(dir, "burned-in-text.mp4", { seconds: 1, seed: 151 });
  await signIn(page);
  // The draft and its clip are made through the API with the page's own session.
  const created = await page.request.post("/api/exams", {
    data: {
      applicationCode: "efast",
      performedAt: new Date(Date.now() - 3_600_000).toISOString(),
      setting: "simulated",
      transducer: "curvilinear",
      preset: "Abdomen",
      indication: "",
      findings: [],
    },
  });
  expect(created.status()).toBe(201);
  const { exam } = (await created.json()) as { exam: { id: string } };
  const upload = await page.request.post(`/api/exams/${exam.id}/clips`, {
    multipart: { file: { name: "burned-in-text.mp4", mimeType: "video/mp4", buffer: fs.readFileSync(clipFile) }, view: "ruq" },
  });
  expect(upload.status()).toBe(202);

  await page.goto(`/exams/${exam.id}`);
  const panel = page.getByRole("region", { name: "Clip 1: Right upper quadrant" });
  // The clip's one status element, by name (the page has a status line of its own as well).
  const state = panel.getByRole("status", { name: "State of Clip 1: Right upper quadrant" });
  await expect(state).toHaveText("Ready", { timeout: 30_000 });
  await panel.getByRole("button", { name: "Redact…" }).click();
  await panel.getByRole("button", { name: "Add a box" }).click();
  const box = panel.getByRole("button", { name: /^Box 1:/ });
  await expect(box).toBeFocused();
  await page.keyboard.press("ArrowLeft");
  await page.keyboard.press("Shift+ArrowDown");
  await expect(box).toHaveAccessibleName("Box 1: left 39.0%, top 45.0%, width 20.0%, height 11.0%");
  await expect(panel.getByLabel("Left % of box 1")).toHaveValue("39");
  await shot(page, testInfo, "exams-redaction");
  await panel.getByRole("button", { name: "Save boxes and reprocess" }).click();
  await expect(state).toHaveText(/^(Queued|Processing)$/);
  await expect(state).toHaveText("Ready", { timeout: 30_000 });
  await expect(panel.getByText("1 box")).toBeVisible();
  fs.rmSync(dir, { recursive: true, force: true });
});

test("a clip being processed names its state once on the exam page", async ({ page }) => {
  await signIn(page);
  // The answer is altered on its way to the page so the clip stays "processing" while we look.
  const exam = await draftShowingOneClip(
    page,
    { applicationCode: "efast", setting: "simulated", transducer: "curvilinear" },
    {
      id: "00000000-0000-4000-8000-000000000002",
      view: "ruq",
      state: "processing",
      error: null,
      originalName: "sweep.mp4",
    },
  );
  await page.goto(`/exams/${exam.id}`);
  const panel = page.getByRole("region", { name: "Clip 1: Right upper quadrant" });
  await expect(panel.getByRole("status", { name: "State of Clip 1: Right upper quadrant" })).toHaveText("Processing");
  await expect(panel.getByText(/processing/i)).toHaveCount(1);
  await expect(panel.getByText("The player appears here when the clip is ready.")).toBeVisible();
});

test("a clip that failed processing shows the reason and a Retry button", async ({ page }) => {
  await signIn(page);
  // The answer is altered on its way to the page: a failure takes the worker several attempts.
  const exam = await draftShowingOneClip(
    page,
    { applicationCode: "dvt", setting: "educational", transducer: "linear" },
    {
      id: "00000000-0000-4000-8000-000000000001",
      view: null,
      state: "failed",
      error: "The video could not be read: the file ends before its first frame",
      originalName: "cut-short.mp4",
    },
  );
  await page.goto(`/exams/${exam.id}/edit`);
  const row = page.getByRole("listitem", { name: "Clip cut-short.mp4" });
  await expect(row.getByText("Failed", { exact: true })).toBeVisible();
  await expect(row).toContainText("the file ends before its first frame");
  await expect(row.getByRole("button", { name: "Retry cut-short.mp4" })).toBeVisible();
  await expect(page.getByText("Retry or remove 1 clip that failed processing.")).toBeVisible();
  await expect(page.getByRole("button", { name: "Submit for review" })).toBeDisabled();
});
