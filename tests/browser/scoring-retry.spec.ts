// The scoring screen while the server answers 503 (the database restarting): the autosave
// says it is waiting for the server and saves by itself once the server answers again; a
// submit that gets a 503 is sent again by itself and goes through, with no score lost.
// In the second demo program, so no other spec's queue is touched.
import fs from "node:fs";
import { expect, test, type Route } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD } from "./support";

const LEAD = "admin@tamsinridge.example";
const REVIEWER = "reviewer@tamsinridge.example";
const SONOGRAPHER = "sonographer@tamsinridge.example";
test.use({ viewport: { width: 1440, height: 900 } });

const unavailable = (route: Route) =>
  route.fulfill({
    status: 503,
    contentType: "application/json",
    headers: { "Retry-After": "5" },
    body: JSON.stringify({ error: { code: "database_unavailable", message: "The database is not reachable right now" } }),
  });

test("autosave and submit wait out a 503 and save by themselves", async ({ page, baseURL }) => {
  test.setTimeout(90_000);
  const lead = await apiAs(baseURL!, LEAD);
  const before = (await (await lead.get("/api/settings")).json()).settings.doubleReadShare;
  expect((await lead.patch("/api/settings", { data: { doubleReadShare: 0 } })).ok()).toBe(true);
  try {
    const sono = await apiAs(baseURL!, SONOGRAPHER);
    const apps = await (await sono.get("/api/applications")).json();
    const biliary = apps.applications.find((a: { code: string }) => a.code === "biliary");
    const created = await sono.post("/api/exams", {
      data: {
        applicationCode: "biliary",
        performedAt: new Date(Date.now() - 20 * 60_000).toISOString(),
        setting: "clinical",
        transducer: "curvilinear",
        preset: "Abdomen",
        indication: "Right upper quadrant pain",
        findings: biliary.findings.map((f: { key: string }) => ({ key: f.key, read: "negative" })),
      },
    });
    expect(created.status()).toBe(201);
    const { exam } = await created.json();
    const file = h264Mp4(fixtureDir(), "gb-sweep.mp4", { seconds: 2, seed: 43 });
    const upload = await sono.post(`/api/exams/${exam.id}/clips`, {
      multipart: { file: { name: "gb-sweep.mp4", mimeType: "video/mp4", buffer: fs.readFileSync(file) }, view: biliary.views[0].key },
    });
    expect(upload.status()).toBe(202);
    await expect
      .poll(async () => (await (await sono.get(`/api/exams/${exam.id}`)).json()).exam.clips.map((c: { state: string }) => c.state).join(","), {
        timeout: 30_000,
      })
      .toBe("ready");
    expect((await sono.post(`/api/exams/${exam.id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBe(true);

    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(REVIEWER);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByLabel("Password").press("Enter");
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    await page.goto("/queue?application=biliary");
    await expect(page.getByRole("heading", { level: 1, name: "Queue" })).toBeVisible();
    await page.keyboard.press("n");
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(`Exam ${exam.code}`);

    // The server is "down" for the first two autosaves.
    let draftsRefused = 0;
    await page.route("**/api/assignments/*/draft", (route) => (draftsRefused++ < 2 ? unavailable(route) : route.continue()));
    const criteria = page.getByRole("region", { name: /General image review/ }).getByRole("radiogroup");
    const count = await criteria.count();
    // Clicked, not typed: this spec is about the 503s (scoring.spec.ts covers the keyboard
    // path), and a "1" typed while the first autosave's status re-renders was once lost.
    for (let i = 0; i < count; i++) await criteria.nth(i).getByRole("radio").first().check();
    await page.keyboard.press("Tab");
    await expect(page.getByRole("status").filter({ hasText: "Waiting for the server" })).toBeVisible({ timeout: 10_000 });
    await expect(page.getByRole("status").filter({ hasText: /^Saved \d/ })).toBeVisible({ timeout: 15_000 });
    expect(draftsRefused).toBeGreaterThanOrEqual(3);

    const findings = page.getByRole("region", { name: "Your read of each finding" }).getByRole("radiogroup");
    const findingCount = await findings.count();
    for (let i = 0; i < findingCount; i++) {
      await page.keyboard.press("n");
      await page.keyboard.press("Tab");
    }
    await page.keyboard.type("Good long-axis view of the gallbladder.");

    // The first submit gets a 503; the client sends it again by itself.
    let submitsRefused = 0;
    await page.route("**/api/assignments/*/review", (route) => (submitsRefused++ < 1 ? unavailable(route) : route.continue()));
    await page.keyboard.press("Control+Enter");
    await expect(page.getByText("Waiting for the server to take your review")).toBeVisible();
    await expect(page).toHaveURL(/\/queue\?application=biliary$/, { timeout: 15_000 });
    expect(submitsRefused).toBe(2);
    const feedback = await sono.get(`/api/exams/${exam.id}`);
    expect((await feedback.json()).exam.status).toBe("reviewed");
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: before } });
  }
});
