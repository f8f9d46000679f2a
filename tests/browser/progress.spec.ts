// The learner's Progress screen, end to end. Through the API the demo sonographer (Noa
// Hartwell) submits four educational lung exams performed on four days about 200 days ago
// (a range no other test uses), and a reviewer scores them at overall image quality 4, 5, 3
// and 2 in the order performed; the QA lead tightens the learning-curve settings so that a
// handful of exams can give a signal. In the browser the learner opens Progress for that
// range and sees the threshold, the learning-curve sentence and its limits, the criterion
// trends (chart and table) and accuracy against the reviewer; then enters a confirmatory
// result on an exam's page and finds it in the accuracy against confirmatory results.
//
// Expected figures are worked out here from first principles, not read back from the app:
// - credit: quality at or above the program's minimum (3 by default, shared/rubric/default-rubric.ts);
// - CUSUM limits and steps: Wald's sequential probability ratio test in the form used for
//   learning curves by Bolsin & Colson (2000), written out below from memory;
// - Wilson score interval (Wilson 1927), written out below from memory; at n of n the lower
//   bound is n / (n + z²), a closed form (e.g. 15/15 → 0.796);
// - attainment of an ordinal level: steps to the nearest ideal level over the largest such
//   distance (the definition in notes on issue 6; quality levels 4 and 5 are ideal).
// They are also compared with GET /api/me/progress, the program's own answer.
import fs from "node:fs";
import { expect, test } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD, scores, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const LEARNER = "sonographer@cedarhollow.example";
const REVIEWER = "reviewer@cedarhollow.example";
const APP = { code: "lung", name: "Lung / thoracic" };
// Quality per exam in the order performed; the last is below the minimum for credit.
const QUALITY = ["4", "5", "3", "2"];
// Tight learning-curve settings so that three credited exams reach the competence limit.
const CUSUM = { p0: 0.1, p1: 0.5, alpha: 0.2, beta: 0.2 };
const Z = 1.959963984540054; // standard normal 97.5th percentile

type Workspace = { assignment: { id: string }; exam: { id: string } };
type Read = { key: string; read: "positive" | "negative" };
type ProgressAnswer = {
  window: number;
  settings: { threshold: number };
  applications: {
    application: { code: string };
    submitted: number;
    reviewed: number;
    credited: number;
    threshold: number;
    cusum: { h0: number; h1: number; signal: string; signalAtAttempt: number | null };
    accuracyVsReviewer: { sensitivity: { successes: number; n: number } };
  }[];
};

/** Every criterion at its ideal level except overall image quality. */

/** Wald / Bolsin–Colson CUSUM: steps and limits for failure rates p0 (acceptable) and p1 (unacceptable). */
function cusumLimits({ p0, p1, alpha, beta }: typeof CUSUM) {
  const P = Math.log(p1 / p0);
  const Q = Math.log((1 - p0) / (1 - p1));
  return { s: Q / (P + Q), h0: -Math.log((1 - alpha) / beta) / (P + Q), h1: Math.log((1 - beta) / alpha) / (P + Q) };
}

/** Wilson (1927) score interval at 95%, without continuity correction. */
function wilson(x: number, n: number): [number, number] {
  const p = x / n;
  const denom = 1 + (Z * Z) / n;
  const centre = (p + (Z * Z) / (2 * n)) / denom;
  const half = (Z / denom) * Math.sqrt((p * (1 - p)) / n + (Z * Z) / (4 * n * n));
  return [Math.max(0, centre - half), Math.min(1, centre + half)];
}

/** "50% (9–91%)", the way the screen writes a rate with its interval. */
const rateText = (x: number, n: number) => {
  const [lo, hi] = wilson(x, n);
  return `${Math.round((100 * x) / n)}% (${Math.round(lo * 100)}–${Math.round(hi * 100)}%)`;
};

/** Attainment of an ordinal level: 1 − (steps to the nearest ideal level) / (largest such distance). */
function qualityAttainment(q: string): number {
  const levels = ["1", "2", "3", "4", "5"];
  const ideal = [3, 4]; // indexes of "4" and "5"
  const distance = (i: number) => Math.min(...ideal.map((j) => Math.abs(i - j)));
  const worst = Math.max(...levels.map((_, i) => distance(i)));
  return 1 - distance(levels.indexOf(q)) / worst;
}

const utcDay = (d: Date) => d.toISOString().slice(0, 10);
const signed = (v: number) => (v < 0 ? `−${Math.abs(v).toFixed(2)}` : v.toFixed(2));

test("a learner sees threshold, learning curve, trends and accuracy, and a confirmatory result they enter counts", async ({ browser, baseURL }, testInfo) => {
  test.setTimeout(150_000);
  const base = baseURL!;
  const lead = await apiAs(base, LEAD);
  const learner = await apiAs(base, LEARNER);
  const reviewer = await apiAs(base, REVIEWER);
  const dir = fixtureDir();
  const { settings: before } = (await (await lead.get("/api/settings")).json()) as { settings: Record<string, number> };

  // Four days in a row, 200 days ago, at noon UTC; the range is one day wider on each side.
  const dayMs = 86_400_000;
  const first = new Date(Math.floor(Date.now() / dayMs) * dayMs - 200 * dayMs + 12 * 3_600_000);
  const performed = QUALITY.map((_, i) => new Date(first.getTime() + i * dayMs));
  const from = utcDay(new Date(first.getTime() - dayMs));
  const to = utcDay(new Date(first.getTime() + QUALITY.length * dayMs));

  try {
    expect(
      (
        await lead.patch("/api/settings", {
          data: { doubleReadShare: 0, cusumAcceptableRate: CUSUM.p0, cusumUnacceptableRate: CUSUM.p1, cusumAlpha: CUSUM.alpha, cusumBeta: CUSUM.beta },
        })
      ).ok(),
    ).toBeTruthy();

    const { applications } = (await (await learner.get("/api/applications")).json()) as {
      applications: { code: string; findings: { key: string; label: string }[] }[];
    };
    const lung = applications.find((a) => a.code === APP.code)!;
    const [first_, second_] = lung.findings;
    // The learner reads the first finding positive on the first exam, everything else negative.
    const learnerReads = (i: number): Read[] => lung.findings.map((f) => ({ key: f.key, read: i === 0 && f.key === first_.key ? "positive" : "negative" }));
    // The reviewer agrees, except on the second finding of the fourth exam (a false negative), which fails on quality anyway: a misread blocks credit on every setting.
    const reviewerReads = (i: number): Read[] => learnerReads(i).map((r) => (i === 3 && r.key === second_.key ? { key: r.key, read: "positive" as const } : r));
    const buffer = fs.readFileSync(h264Mp4(dir, "lung.mp4", { seconds: 1, seed: 61 }));

    const examIds: string[] = [];
    const examCodes: string[] = [];
    for (const [i, at] of performed.entries()) {
      const created = await learner.post("/api/exams", {
        data: {
          applicationCode: APP.code,
          performedAt: at.toISOString(),
          setting: "educational",
          transducer: "linear",
          preset: "Lung",
          indication: `Lung practice ${i + 1}`,
          findings: learnerReads(i),
        },
      });
      expect(created.status(), await created.text()).toBe(201);
      const { exam } = (await created.json()) as { exam: { id: string; code: string } };
      const upload = await learner.post(`/api/exams/${exam.id}/clips`, {
        multipart: { view: "anterior_right", file: { name: "lung.mp4", mimeType: "video/mp4", buffer } },
      });
      expect(upload.status()).toBe(202);
      examIds.push(exam.id);
      examCodes.push(exam.code);
    }
    for (const id of examIds) {
      await expect
        .poll(
          async () =>
            ((await (await learner.get(`/api/exams/${id}`)).json()) as { exam: { clips: { state: string }[] } }).exam.clips.map((c) => c.state).join(","),
          { timeout: 45_000 },
        )
        .toBe("ready");
      expect((await learner.post(`/api/exams/${id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBeTruthy();
    }

    // The reviewer reads each of them (whatever order the queue hands them out in).
    const index = new Map(examIds.map((id, i) => [id, i]));
    const released: string[] = [];
    let done = 0;
    for (let k = 0; k < 40 && done < examIds.length; k++) {
      const res = await reviewer.post("/api/queue/next", { data: { application: APP.code } });
      expect(res.status(), "a lung read should be waiting").toBe(200);
      const ws = (await res.json()) as Workspace;
      const i = index.get(ws.exam.id);
      if (i === undefined) {
        released.push(ws.assignment.id);
        continue;
      }
      const review = await reviewer.post(`/api/assignments/${ws.assignment.id}/review`, {
        data: { scores: scores(QUALITY[i]), reads: reviewerReads(i), feedback: `Lung practice ${i + 1}: sweep every zone.` },
      });
      expect(review.status(), await review.text()).toBe(201);
      done++;
    }
    for (const id of released) await reviewer.post(`/api/assignments/${id}/release`);
    expect(done).toBe(examIds.length);

    // --- Worked out here.
    const minQuality = before.minQualityForCredit ?? 3;
    const credited = QUALITY.filter((q) => Number(q) >= minQuality).length;
    const limits = cusumLimits(CUSUM);
    let value = 0;
    let signalAt: number | null = null;
    QUALITY.forEach((q, i) => {
      value += Number(q) >= minQuality ? -limits.s : 1 - limits.s;
      if (signalAt === null && value <= limits.h0) signalAt = i + 1;
    });
    expect(signalAt, "these settings should signal competence within four exams").toBe(3);
    const qualityMean = QUALITY.reduce((s, q) => s + qualityAttainment(q), 0) / QUALITY.length;

    // --- The program's own answer agrees.
    const answer = (await (await learner.get(`/api/me/progress?from=${from}&to=${to}&window=5`)).json()) as ProgressAnswer;
    const apiLung = answer.applications.find((a) => a.application.code === APP.code)!;
    expect(apiLung.submitted).toBe(QUALITY.length);
    expect(apiLung.reviewed).toBe(QUALITY.length);
    expect(apiLung.credited).toBe(credited);
    expect(apiLung.cusum.h0).toBeCloseTo(limits.h0, 10);
    expect(apiLung.cusum.h1).toBeCloseTo(limits.h1, 10);
    expect(apiLung.cusum.signal).toBe("competent");
    expect(apiLung.cusum.signalAtAttempt).toBe(signalAt);
    const threshold = apiLung.threshold;
    expect(threshold).toBe(before.credentialingThreshold ?? 25);

    // --- The browser: Progress from the navigation, then the range and window.
    const page = await (await browser.newContext({ viewport: { width: 1280, height: 900 } })).newPage();
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(LEARNER);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Progress" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Progress" })).toBeVisible();
    const main = page.getByRole("main");
    await main.getByLabel("From", { exact: true }).fill(from);
    await main.getByLabel("To", { exact: true }).fill(to);
    await main.getByLabel("Rolling mean over", { exact: true }).selectOption("5");
    await main.getByLabel("Application", { exact: true }).selectOption(APP.code);
    await expect(page).toHaveURL(new RegExp(`from=${from}.*to=${to}|to=${to}.*from=${from}`));
    await expect(page).toHaveURL(/window=5/);
    await expect(page).toHaveURL(/application=lung/);

    // Toward credentialing: credited of the threshold, reviewed, submitted, not met.
    const summaryRow = main.getByRole("row").filter({ has: page.getByRole("rowheader", { name: APP.name }) });
    await expect(summaryRow).toContainText(`${credited} of ${threshold}`);
    await expect(summaryRow.getByRole("progressbar")).toHaveAttribute("aria-valuetext", `${credited} of ${threshold} credited exams`);
    await expect(summaryRow.getByRole("cell").nth(1)).toHaveText(String(QUALITY.length));
    await expect(summaryRow.getByRole("cell").nth(2)).toHaveText(String(QUALITY.length));
    await expect(summaryRow).toContainText(`${threshold - credited} more needed`);

    // The learning curve: the sentence with the date of the third exam, and both limits.
    const signalDate = await page.evaluate(
      (iso) => new Intl.DateTimeFormat(undefined, { dateStyle: "medium" }).format(new Date(iso)),
      performed[2].toISOString(),
    );
    await expect(main.getByTestId("cusum-sentence")).toHaveText(`Acceptable failure rate reached at attempt ${signalAt} (${signalDate}).`);
    await expect(main.getByRole("img", { name: /^Learning curve for Lung \/ thoracic: 4 reviewed exams, 1 without credit\./ })).toBeVisible();
    await expect(main.getByText(`Acceptable-rate limit h0 = ${signed(limits.h0)}`)).toBeVisible();
    await expect(main.getByText(`Unacceptable limit h1 = ${signed(limits.h1)}`)).toBeVisible();
    await expect(main.getByText("Acceptable failure rate (p0)").locator("..")).toContainText("10%");
    await expect(main.getByText("Unacceptable failure rate (p1)").locator("..")).toContainText("50%");
    await expect(main.getByText(/A failure is a reviewed exam that earned no credentialing credit/)).toBeVisible();

    // Criterion trends: the chart, and its table with quality's rolling mean and overall mean.
    await expect(main.getByRole("img", { name: /^Criterion trends for Lung \/ thoracic: rolling mean over the last 5 exams/ })).toBeVisible();
    await expect(main.locator(".recharts-line").first()).toBeVisible();
    const qualityRow = main.getByRole("row").filter({ has: page.getByRole("rowheader", { name: "Overall image quality" }) });
    // Exams, last-5 mean and all-exams mean (both over the same four exams here).
    await expect(qualityRow.getByRole("cell").nth(0)).toHaveText(String(QUALITY.length));
    await expect(qualityRow.getByRole("cell").nth(1)).toHaveText(`${Math.round(qualityMean * 100)}%`);
    await expect(qualityRow.getByRole("cell").nth(2)).toHaveText(`${Math.round(qualityMean * 100)}%`);
    await expect(qualityRow).toContainText("Falling");
    const depthRow = main.getByRole("row").filter({ has: page.getByRole("rowheader", { name: "Depth" }) });
    await expect(depthRow.getByRole("cell").nth(1)).toHaveText("100%");

    // Accuracy against the reviewer: 1 true positive and 1 false negative → sensitivity 1 of 2.
    const vsReviewer = main.getByRole("table", { name: /Against the reviewer’s final read/ });
    const sensitivity = vsReviewer.getByRole("row").filter({ has: page.getByRole("rowheader", { name: /^Sensitivity/ }) });
    await expect(sensitivity).toContainText(rateText(1, 2));
    await expect(sensitivity).toContainText("1 of 2");
    expect(apiLung.accuracyVsReviewer.sensitivity).toMatchObject({ successes: 1, n: 2 });
    const negatives = lung.findings.length * QUALITY.length - 2;
    const specificity = vsReviewer.getByRole("row").filter({ has: page.getByRole("rowheader", { name: /^Specificity/ }) });
    await expect(specificity).toContainText(rateText(negatives, negatives));
    // n of n: the closed form n / (n + z²) gives the lower bound.
    expect(rateText(negatives, negatives)).toBe(`100% (${Math.round((100 * negatives) / (negatives + Z * Z))}–100%)`);
    await expect(main.getByText("No confirmatory results entered yet.", { exact: false })).toBeVisible();
    await shot(page, testInfo, "progress");

    // --- A confirmatory result on the first exam's page: CT showed the first finding.
    await page.goto(`/exams/${examIds[0]}`);
    const confirmations = page.getByRole("region", { name: "Confirmatory results" });
    await expect(confirmations).toBeVisible();
    // Folded on the exam page until asked for.
    await confirmations.getByText("Enter confirmatory results").click();
    const firstGroup = confirmations.getByRole("group", { name: first_.label });
    const secondGroup = confirmations.getByRole("group", { name: second_.label });
    await expect(firstGroup).toContainText("Clinician’s read: Positive");
    await firstGroup.getByLabel("Confirmed by").selectOption("ct");
    // A method without a result is refused next to the field.
    await secondGroup.getByLabel("Confirmed by").selectOption("formal_echo");
    await confirmations.getByRole("button", { name: "Save confirmatory results" }).click();
    await expect(firstGroup.getByRole("group", { name: "Result" })).toContainText("Say what the confirmatory test showed");
    await firstGroup.getByRole("radio", { name: "Positive" }).check();
    await secondGroup.getByLabel("Confirmed by").selectOption("none");
    await secondGroup.getByLabel(/Note/).fill("No chest imaging was done.");
    await confirmations.getByRole("button", { name: "Save confirmatory results" }).click();
    await expect(confirmations.getByText("Confirmatory results saved.")).toBeVisible();
    await expect(confirmations.getByText(`Change confirmatory results (2 of ${lung.findings.length} findings entered)`)).toBeVisible();
    await expect(firstGroup).toContainText(/entered .+ by Noa Hartwell/);
    await shot(page, testInfo, "progress-confirmations");

    // Back on Progress (same range): counted against confirmatory results, by method.
    await page.goto(`/progress?application=${APP.code}&from=${from}&to=${to}&window=5`);
    const vsConfirmed = page.getByRole("table", { name: /Against confirmatory results/ });
    const confirmedSensitivity = vsConfirmed.getByRole("row").filter({ has: page.getByRole("rowheader", { name: /^Sensitivity/ }) });
    await expect(confirmedSensitivity).toContainText(rateText(1, 1));
    await expect(confirmedSensitivity).toContainText("1 of 1");
    expect(rateText(1, 1)).toBe("100% (21–100%)");
    await expect(page.getByText(/Confirmed by method:/).locator("..")).toContainText("Confirmed by method: CT 1 · None 1");
    await shot(page, testInfo, "progress-confirmed");

    // --- Feedback: the timeline filtered to lung exams without credit, the filters in the address.
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Feedback" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Feedback" })).toBeVisible();
    await page.getByLabel("Application", { exact: true }).selectOption(APP.code);
    await page.getByLabel("Credit", { exact: true }).selectOption("no");
    await page.getByLabel("Not yet acknowledged").check();
    await expect(page).toHaveURL(/application=lung/);
    await expect(page).toHaveURL(/credit=no/);
    await expect(page).toHaveURL(/unacknowledged=1/);
    const entries = page.getByRole("main").getByRole("link", { name: /^EX-/ });
    // Only the exam reviewed at a quality below the minimum earned no credit.
    await expect(entries).toHaveCount(QUALITY.filter((q) => Number(q) < minQuality).length);
    const failedCode = examCodes[QUALITY.findIndex((q) => Number(q) < minQuality)];
    const entry = page.getByRole("row").filter({ has: page.getByRole("link", { name: failedCode }) });
    await expect(entries).toHaveText([failedCode]);
    await expect(entry).toContainText("No credit");
    await expect(entry).toContainText("Unread");
    await expect(entry).toContainText("Not yet acknowledged");
    // Back to every credit state: all four lung exams, newest review first.
    await page.getByLabel("Credit", { exact: true }).selectOption("");
    await expect(entries).toHaveCount(QUALITY.length);
    await shot(page, testInfo, "progress-feedback-timeline");
  } finally {
    await lead.patch("/api/settings", {
      data: {
        doubleReadShare: before.doubleReadShare ?? 0.2,
        cusumAcceptableRate: before.cusumAcceptableRate ?? 0.1,
        cusumUnacceptableRate: before.cusumUnacceptableRate ?? 0.2,
        cusumAlpha: before.cusumAlpha ?? 0.1,
        cusumBeta: before.cusumBeta ?? 0.1,
      },
    });
    await Promise.all([lead.dispose(), learner.dispose(), reviewer.dispose()]);
    fs.rmSync(dir, { recursive: true, force: true });
  }
});
