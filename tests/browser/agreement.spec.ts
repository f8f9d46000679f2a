// The agreement report reads what the statistics module computes: every exam is read twice
// for this test, a sonographer submits six educational eFAST exams through the API, two
// reviewers score them (same values everywhere except overall image quality, which varies
// and sometimes differs by more than one step), and in the browser the QA lead opens
// Oversight → Agreement for today and finds the quadratic-weighted Cohen's kappa of
// "Overall image quality" equal to the one this test computes with shared/stats, and the
// same for Krippendorff's alpha and its bootstrap interval.
import fs from "node:fs";
import { expect, test, type APIRequestContext } from "@playwright/test";
import { cohensKappa, krippendorffAlpha } from "../../shared/stats/index";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD, scores, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const SONOGRAPHER = "sonographer@cedarhollow.example";
const REVIEWER = "reviewer@cedarhollow.example";
const SECOND_REVIEWER = "elias.brunnhold@cedarhollow.example";

// Quality of each exam as (first read, second read): two agree, two differ by one step,
// two by two steps (those go to adjudication; the report counts both reads regardless).
const QUALITY: [string, string][] = [
  ["5", "5"],
  ["4", "3"],
  ["3", "5"],
  ["2", "2"],
  ["5", "3"],
  ["4", "5"],
];

type Workspace = { assignment: { id: string; kind: string }; exam: { id: string } };

/** Claims the next eFAST read, submits it with the quality this exam gets from this reader, and says which read it was. */
async function readNext(
  reviewer: APIRequestContext,
  quality: (examId: string) => string,
  reads: { key: string; read: string }[],
): Promise<{ examId: string; kind: string; quality: string }> {
  const res = await reviewer.post("/api/queue/next", { data: { application: "efast" } });
  expect(res.status(), "a read should be waiting").toBe(200);
  const ws = (await res.json()) as Workspace;
  const q = quality(ws.exam.id);
  const review = await reviewer.post(`/api/assignments/${ws.assignment.id}/review`, { data: { scores: scores(q), reads, feedback: "" } });
  expect(review.status(), await review.text()).toBe(201);
  return { examId: ws.exam.id, kind: ws.assignment.kind, quality: q };
}

test("the agreement screen shows the weighted kappa of image quality that shared/stats computes", async ({ browser, baseURL }, testInfo) => {
  test.setTimeout(90_000);
  const base = baseURL!;
  const lead = await apiAs(base, LEAD);
  const sonographer = await apiAs(base, SONOGRAPHER);
  const reviewer = await apiAs(base, REVIEWER);
  const secondReviewer = await apiAs(base, SECOND_REVIEWER);
  const dir = fixtureDir();

  try {
    expect((await lead.patch("/api/settings", { data: { doubleReadShare: 1 } })).ok()).toBeTruthy();

    const { applications } = (await (await sonographer.get("/api/applications")).json()) as { applications: { code: string; findings: { key: string }[] }[] };
    const efast = applications.find((a) => a.code === "efast")!;
    const negativeReads = efast.findings.map((f) => ({ key: f.key, read: "negative" }));
    const clip = h264Mp4(dir, "sweep.mp4", { seconds: 1, seed: 11 });
    const buffer = fs.readFileSync(clip);

    // Six small educational exams, one clip each, created and uploaded in parallel.
    const examIds = await Promise.all(
      QUALITY.map(async (_, i) => {
        const created = await sonographer.post("/api/exams", {
          data: {
            applicationCode: "efast",
            performedAt: new Date(Date.now() - (20 - i) * 60_000).toISOString(),
            setting: "educational",
            transducer: "curvilinear",
            preset: "Abdomen",
            indication: `Practice scan ${i + 1}`,
            findings: negativeReads,
          },
        });
        expect(created.status()).toBe(201);
        const { exam } = (await created.json()) as { exam: { id: string } };
        const upload = await sonographer.post(`/api/exams/${exam.id}/clips`, {
          multipart: { view: "ruq", file: { name: "sweep.mp4", mimeType: "video/mp4", buffer } },
        });
        expect(upload.status()).toBe(202);
        return exam.id;
      }),
    );
    await Promise.all(
      examIds.map(async (id) => {
        await expect
          .poll(
            async () =>
              ((await (await sonographer.get(`/api/exams/${id}`)).json()) as { exam: { clips: { state: string }[] } }).exam.clips.map((c) => c.state).join(","),
            {
              timeout: 45_000,
            },
          )
          .toBe("ready");
        expect((await sonographer.post(`/api/exams/${id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBeTruthy();
      }),
    );

    // Each reviewer reads all six; quality follows QUALITY per exam (first reviewer, second
    // reviewer). The report pairs the primary read with the second read of each exam, and
    // which reviewer holds which depends on the queue, so the expected matrix is built the
    // same way from what each claim was.
    const slot = new Map<string, number>();
    const qualityOf = (reader: 0 | 1) => (examId: string) => {
      if (!slot.has(examId)) slot.set(examId, slot.size);
      return QUALITY[slot.get(examId)!][reader];
    };
    const done: { examId: string; kind: string; quality: string }[] = [];
    for (let i = 0; i < QUALITY.length; i++) done.push(await readNext(reviewer, qualityOf(0), negativeReads));
    for (let i = 0; i < QUALITY.length; i++) done.push(await readNext(secondReviewer, qualityOf(1), negativeReads));
    expect(slot.size).toBe(QUALITY.length);
    const pairs = [...slot.keys()].map((examId) => {
      const mine = done.filter((d) => d.examId === examId);
      const primary = mine.find((d) => d.kind === "primary");
      const second = mine.find((d) => d.kind !== "primary");
      expect(primary && second, `both reads of ${examId}`).toBeTruthy();
      return [primary!.quality, second!.quality];
    });

    const expected = cohensKappa(pairs, { weights: "quadratic", categories: ["1", "2", "3", "4", "5"] });
    expect(expected.value).not.toBeNull();
    const shown = expected.value!.toFixed(2).replace("-", "\u2212");

    // The QA lead opens the report for today's range through the navigation.
    const page = await (await browser.newContext()).newPage();
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(LEAD);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Agreement" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Agreement" })).toBeVisible();
    // Today's range; it starts on the day the first exam was performed (the server counts
    // dates in UTC), which is today except within the first minutes after midnight.
    const today = new Date().toISOString().slice(0, 10);
    const firstDay = new Date(Date.now() - 20 * 60_000).toISOString().slice(0, 10);
    await page.getByLabel("From").fill(firstDay);
    await page.getByLabel("To").fill(today);
    await expect(page).toHaveURL(new RegExp(`from=${firstDay}.*to=${today}|to=${today}.*from=${firstDay}`));

    const qualityRow = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: /Overall image quality/ }) });
    await expect(qualityRow.getByRole("cell").first()).toHaveText(String(QUALITY.length));
    await expect(qualityRow.locator('[data-stat="kappa"]')).toHaveText(shown);
    await expect(qualityRow).toContainText("quadratic weights");

    // Ordinal alpha with its bootstrap interval: the resamples and seed the report states,
    // applied by shared/stats to the same pairs, give the figures on screen.
    const report = (await (await lead.get(`/api/reports/agreement?from=${firstDay}&to=${today}`)).json()) as {
      criteria: { key: string; alpha: { bootstrap: { samples: number; seed: number } } }[];
    };
    const boot = report.criteria.find((c) => c.key === "quality")!.alpha.bootstrap;
    const alpha = krippendorffAlpha(pairs, { level: "ordinal", bootstrap: { samples: boot.samples, seed: boot.seed } });
    expect(alpha.ci95, "the bootstrap gives an interval for these reads").toBeDefined();
    const two = (x: number) => (x.toFixed(2) === "-0.00" ? "0.00" : x.toFixed(2).replace("-", "\u2212"));
    await expect(qualityRow.locator('[data-stat="alpha"]')).toHaveText(two(alpha.value!));
    await expect(qualityRow.locator('[data-stat-interval="alpha"]')).toHaveText(`[${two(alpha.ci95![0])}, ${two(alpha.ci95![1])}]`);

    // The drill-down lists exams whose quality differs (at least the two apart by two steps),
    // each linking to the exam page.
    await page.getByLabel("Criterion", { exact: true }).selectOption("quality");
    const drill = page.getByRole("region", { name: "Exams in disagreement" });
    await expect(drill.getByRole("link").first()).toHaveAttribute("href", /^\/exams\/[0-9a-f-]+$/);
    expect(await drill.getByRole("link").count()).toBeGreaterThanOrEqual(2);
    await shot(page, testInfo, "agreement");
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: 0.2 } });
    await Promise.all([lead.dispose(), sonographer.dispose(), reviewer.dispose(), secondReviewer.dispose()]);
    fs.rmSync(dir, { recursive: true, force: true });
  }
});
