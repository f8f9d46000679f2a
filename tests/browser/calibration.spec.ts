// A calibration set from end to end. Set-up through the API: the sonographer submits two
// educational aorta exams (double reads off, so each has one primary read) and the QA lead,
// who also reviews, reads them so they leave the queue. In the browser the QA lead creates a
// set of the two exams for two reviewers, giving the first a reference answer with the
// keyboard. The two reviewers do their blinded calibration reads through the API. The lead
// then opens the set's results and finds Fleiss' kappa and Krippendorff's alpha that this test
// works out by hand (and cross-checks with shared/stats), and each reviewer's matches with the
// reference answer.
import fs from "node:fs";
import { expect, test } from "@playwright/test";
import { fleissKappa, krippendorffAlpha } from "../../shared/stats/index";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const SONOGRAPHER = "sonographer@cedarhollow.example";
const REVIEWER_A = { email: "reviewer@cedarhollow.example", name: "Imani Lindqvist" };
const REVIEWER_B = { email: "elias.brunnhold@cedarhollow.example", name: "Elias Brunnhold" };
// Active reviewers of the demo program left out of this set.
const NOT_IN_SET = ["Harriet Quillon", "Amara Dunleavy"];

test.use({ viewport: { width: 1280, height: 900 } });

type Scores = Record<string, string>;
const IDEAL: Scores = { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete" };

// What each reviewer answers on exam 1 and exam 2 (quality; depth; the aneurysm read). The
// reference answer on exam 1: every ideal level, quality 4, aneurysm positive.
const READS: Record<string, [{ scores: Scores; aneurysm: string }, { scores: Scores; aneurysm: string }]> = {
  [REVIEWER_A.email]: [
    { scores: { ...IDEAL, quality: "4" }, aneurysm: "positive" },
    { scores: { ...IDEAL, quality: "2" }, aneurysm: "negative" },
  ],
  [REVIEWER_B.email]: [
    { scores: { ...IDEAL, depth: "too_deep", quality: "4" }, aneurysm: "negative" },
    { scores: { ...IDEAL, quality: "3" }, aneurysm: "negative" },
  ],
};

/** Two-decimal coefficient as the screen writes it (true minus sign). */
const shown = (v: number) => {
  const s = v.toFixed(2);
  return s === "-0.00" ? "0.00" : s.replace("-", "\u2212");
};

type Workspace = { assignment: { id: string; kind: string }; exam: { id: string } };

test("the QA lead sends a calibration set with a reference answer and reads agreement and matches that the test works out", async ({
  browser,
  baseURL,
}, testInfo) => {
  test.setTimeout(120_000);
  const base = baseURL!;
  const lead = await apiAs(base, LEAD);
  const sono = await apiAs(base, SONOGRAPHER);
  const reviewerA = await apiAs(base, REVIEWER_A.email);
  const reviewerB = await apiAs(base, REVIEWER_B.email);
  const dir = fixtureDir();
  const before = (await (await lead.get("/api/settings")).json()).settings.doubleReadShare;
  expect((await lead.patch("/api/settings", { data: { doubleReadShare: 0 } })).ok()).toBe(true);

  try {
    // Two aorta exams with one processed clip each, submitted.
    const buffer = fs.readFileSync(h264Mp4(dir, "aorta-sweep.mp4", { seconds: 1, seed: 23 }));
    const exams = await Promise.all(
      [0, 1].map(async (i) => {
        const created = await sono.post("/api/exams", {
          data: {
            applicationCode: "aorta",
            performedAt: new Date(Date.now() - (30 - i) * 60_000).toISOString(),
            setting: "educational",
            transducer: "curvilinear",
            preset: "Abdomen",
            indication: `Calibration practice ${i + 1}`,
            findings: [{ key: "aneurysm", read: "negative" }],
          },
        });
        expect(created.status(), await created.text()).toBe(201);
        const { exam } = (await created.json()) as { exam: { id: string; code: string } };
        const upload = await sono.post(`/api/exams/${exam.id}/clips`, {
          multipart: { view: "longitudinal", file: { name: "aorta-sweep.mp4", mimeType: "video/mp4", buffer } },
        });
        expect(upload.status()).toBe(202);
        await expect
          .poll(
            async () =>
              ((await (await sono.get(`/api/exams/${exam.id}`)).json()) as { exam: { clips: { state: string }[] } }).exam.clips.map((c) => c.state).join(","),
            {
              timeout: 45_000,
            },
          )
          .toBe("ready");
        expect((await sono.post(`/api/exams/${exam.id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBe(true);
        return exam;
      }),
    );
    const examIds = exams.map((e) => e.id);

    // The QA lead (also a reviewer) gives each its primary read, so only calibration work remains.
    for (let i = 0; i < exams.length; i++) {
      const claim = await lead.post("/api/queue/next", { data: { application: "aorta" } });
      expect(claim.status(), "an aorta primary read should be waiting").toBe(200);
      const ws = (await claim.json()) as Workspace;
      expect(examIds, "the queue hands out this test's exams").toContain(ws.exam.id);
      const review = await lead.post(`/api/assignments/${ws.assignment.id}/review`, {
        data: { scores: { ...IDEAL, quality: "4" }, reads: [{ key: "aneurysm", read: "negative" }], feedback: "" },
      });
      expect(review.status(), await review.text()).toBe(201);
    }

    // In the browser: Oversight → Calibration → New calibration set.
    const page = await (await browser.newContext()).newPage();
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(LEAD);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Calibration" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Calibration" })).toBeVisible();
    await page.getByRole("link", { name: "New calibration set" }).first().click();
    await expect(page.getByRole("heading", { level: 1, name: "New calibration set" })).toBeVisible();

    const setName = `Aorta calibration ${Date.now().toString(36)}`;
    await page.getByLabel("Name", { exact: true }).fill(setName);
    for (const name of NOT_IN_SET) await page.getByRole("checkbox", { name: new RegExp(name) }).uncheck();
    await expect(page.getByRole("checkbox", { name: new RegExp(REVIEWER_A.name) })).toBeChecked();
    await expect(page.getByRole("checkbox", { name: new RegExp(REVIEWER_B.name) })).toBeChecked();

    // An id that is no exam of the program: flagged on its row, and the server's refusal
    // ("exams.2.examId") lands on the same row.
    const unknownId = "00000000-0000-4000-8000-00000000c0de";
    await page.getByLabel("Exam ids").fill([...examIds, unknownId].join("\n"));
    await expect(page.getByText("3 exams chosen")).toBeVisible();
    const answers = page.getByRole("region", { name: "Reference answers (optional)" });
    const unknownRow = answers.getByRole("listitem").filter({ hasText: unknownId });
    await expect(unknownRow).toContainText("No submitted exam with this id in the program");
    await page.getByRole("button", { name: "Create and send" }).click();
    await expect(page.getByRole("alert")).toContainText("check the exams marked below");
    await expect(unknownRow.getByText("No submitted exam with this id in the program")).toHaveCount(1);
    await expect(page).toHaveURL(/\/oversight\/calibration\/new$/);
    await page.getByLabel("Exam ids").fill(examIds.join("\n"));
    await expect(page.getByText("2 exams chosen")).toBeVisible();
    await expect(unknownRow).toHaveCount(0);
    await expect(page.getByRole("alert")).toHaveCount(0);

    // The reference answer for exam 1, with the keyboard: a digit per criterion, Enter to move on.
    const firstExam = answers.getByRole("listitem").filter({ hasText: exams[0].code });
    await expect(firstExam.getByText("Abdominal aorta")).toBeVisible();
    await expect(answers.getByRole("listitem").filter({ hasText: exams[1].code }).getByText("No reference answer")).toBeVisible();
    await firstExam.getByRole("button", { name: `Add reference answer for ${exams[0].code}` }).click();
    const editor = page.getByRole("region", { name: new RegExp(exams[0].code) });
    const groups = editor.getByRole("radiogroup");
    // Seven criteria of the default rubric and the aorta's one finding.
    await expect(groups).toHaveCount(8);
    const digits = ["1", "1", "2", "2", "1", "1", "4"]; // suitable, follows, fits, balanced, standard, complete, 4
    await groups.first().getByRole("radio").first().focus();
    for (const [i, digit] of digits.entries()) {
      await page.keyboard.press(digit);
      await expect(
        groups
          .nth(i)
          .getByRole("radio")
          .nth(Number(digit) - 1),
      ).toBeChecked();
      await page.keyboard.press("Enter");
    }
    // The anchor text of the chosen level is on screen.
    await expect(editor.locator('[data-criterion="quality"] [data-anchor]')).toHaveText("4: Good, with minor flaws.");
    await expect(groups.nth(7)).toContainText("Aneurysm (3 cm or more)");
    await page.keyboard.press("p");
    await expect(groups.nth(7).getByRole("radio", { name: "Positive" })).toBeChecked();
    await expect(firstExam.getByText("Reference: 7 of 7 criteria, 1 of 1 finding")).toBeVisible();
    await shot(page, testInfo, "calibration-new-set");

    await page.getByRole("button", { name: "Create and send" }).click();
    await expect(page).toHaveURL(/\/oversight\/calibration\/[0-9a-f-]{36}$/);
    await expect(page.getByText("Calibration set created: 2 exams sent to the reviewers' queues, 1 with a reference answer.")).toBeVisible();

    // Each reviewer does the two blinded calibration reads through the API.
    for (const [email, reviewer] of [
      [REVIEWER_A.email, reviewerA],
      [REVIEWER_B.email, reviewerB],
    ] as const) {
      for (let k = 0; k < 2; k++) {
        const claim = await reviewer.post("/api/queue/next", { data: { application: "aorta" } });
        expect(claim.status(), `a calibration read for ${email}`).toBe(200);
        const ws = (await claim.json()) as Workspace;
        expect(ws.assignment.kind).toBe("calibration");
        expect(JSON.stringify(ws), "the reviewer is blinded to the sonographer").not.toContain("Noa Hartwell");
        const which = examIds.indexOf(ws.exam.id);
        expect(which).toBeGreaterThanOrEqual(0);
        const mine = READS[email][which];
        const review = await reviewer.post(`/api/assignments/${ws.assignment.id}/review`, {
          data: { scores: mine.scores, reads: [{ key: "aneurysm", read: mine.aneurysm }], feedback: "" },
        });
        expect(review.status(), await review.text()).toBe(201);
      }
      expect((await reviewer.post("/api/queue/next", { data: { application: "aorta" } })).status(), `${email} has nothing left`).toBe(204);
    }

    // Expected values, worked out by hand and cross-checked with shared/stats.
    // Overall image quality, exams × reviewers: [[4, 4], [2, 3]].
    //  Fleiss (1971): P̄ = (1 + 0)/2 = 0.5; category shares 4: 2/4, 2: 1/4, 3: 1/4, so
    //  P̄e = 0.25 + 0.0625 + 0.0625 = 0.375; kappa = (0.5 − 0.375)/(1 − 0.375) = 0.2.
    //  Krippendorff's ordinal alpha (Krippendorff 2011, "Computing Krippendorff's Alpha-
    //  Reliability", ordinal metric δ² = (Σ_{g=c..k} n_g − (n_c + n_k)/2)²): values n_2 = 1,
    //  n_3 = 1, n_4 = 2 (n = 4); δ²(2,3) = 1, δ²(2,4) = 6.25, δ²(3,4) = 2.25; observed
    //  D_o = (1 + 1)/4 = 0.5; expected D_e = 2·(1·1·1 + 1·2·6.25 + 1·2·2.25)/(4·3) = 3;
    //  alpha = 1 − 0.5/3 = 5/6.
    // Depth, [[fits, too deep], [fits, fits]]: kappa = (0.5 − (9/16 + 1/16))/(1 − 10/16) = −1/3;
    //  nominal alpha = 1 − (n − 1)·Σo(c≠k)/Σ n_c·n_k(c≠k) = 1 − 3·2/(2·3·1) = 0.
    const quality = [
      [3, 3],
      [1, 2],
    ]; // level positions of 4, 4 / 2, 3
    const depth = [
      ["fits", "too_deep"],
      ["fits", "fits"],
    ];
    const byHand = { qualityKappa: 0.2, qualityAlpha: 5 / 6, depthKappa: -1 / 3, depthAlpha: 0 };
    expect(fleissKappa(quality, { categories: [0, 1, 2, 3, 4] }).value).toBeCloseTo(byHand.qualityKappa, 12);
    expect(krippendorffAlpha(quality, { level: "ordinal" }).value).toBeCloseTo(byHand.qualityAlpha, 12);
    expect(fleissKappa(depth, { categories: ["too_shallow", "fits", "too_deep"] }).value).toBeCloseTo(byHand.depthKappa, 12);
    expect(krippendorffAlpha(depth, { level: "nominal" }).value).toBeCloseTo(byHand.depthAlpha, 12);

    // The lead opens the results (reload: the reads came in after the page loaded).
    await page.reload();
    await expect(page.getByRole("heading", { level: 1, name: setName })).toBeVisible();
    await expect(page.locator(`[data-exam="${exams[0].code}"]`).getByText("Reference answer")).toBeVisible();
    await expect(page.locator(`[data-exam="${exams[1].code}"]`).getByText("Reference answer")).toHaveCount(0);

    const row = (label: string) =>
      page
        .getByRole("region", { name: "Agreement per criterion" })
        .getByRole("row")
        .filter({ has: page.getByRole("rowheader", { name: label }) });
    await expect(row("Overall image quality").locator('[data-stat="fleiss"]')).toHaveText(shown(byHand.qualityKappa));
    await expect(row("Overall image quality").locator('[data-stat="alpha"]')).toHaveText(shown(byHand.qualityAlpha));
    await expect(row("Overall image quality").getByRole("cell").first()).toHaveText("2");
    await expect(row("Depth").locator('[data-stat="fleiss"]')).toHaveText(shown(byHand.depthKappa));
    await expect(row("Depth").locator('[data-stat="alpha"]')).toHaveText(shown(byHand.depthAlpha));

    // Against the reference (exam 1: seven scores, one finding). Counted by hand from READS:
    // Imani matches all 7 scores and the aneurysm; Elias differs on depth and on the aneurysm.
    const vs = page.getByRole("region", { name: "Against the reference" });
    const reviewerRow = (name: string) => vs.getByRole("row").filter({ has: page.getByRole("rowheader", { name }) });
    await expect(reviewerRow(REVIEWER_A.name).locator('[data-stat="scores"]')).toContainText("7 / 7");
    await expect(reviewerRow(REVIEWER_A.name).locator('[data-stat="reads"]')).toContainText("1 / 1");
    await expect(reviewerRow(REVIEWER_A.name).locator('[data-stat="all"]')).toContainText("100 %");
    await expect(reviewerRow(REVIEWER_B.name).locator('[data-stat="scores"]')).toContainText("6 / 7");
    await expect(reviewerRow(REVIEWER_B.name).locator('[data-stat="reads"]')).toContainText("0 / 1");
    await expect(reviewerRow(REVIEWER_B.name).locator('[data-stat="all"]')).toContainText("6 / 8");
    await expect(reviewerRow(REVIEWER_B.name).locator('[data-stat="all"]')).toContainText("75 %");
    // Exam by exam: the reference beside each reviewer, a difference said in words.
    const depthRow = vs.locator('[data-item="score:depth"]');
    await expect(depthRow.getByRole("cell").first()).toHaveText("Fits the target");
    await expect(depthRow).toContainText("Too deep");
    await expect(depthRow.getByText("differs")).toHaveCount(1);
    await expect(vs.locator('[data-item="read:aneurysm"]').getByText("matches")).toHaveCount(1);
    await shot(page, testInfo, "calibration-results");
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: before } });
    await Promise.all([lead.dispose(), sono.dispose(), reviewerA.dispose(), reviewerB.dispose()]);
    fs.rmSync(dir, { recursive: true, force: true });
  }
});
