// The QA lead's side of learner progress, end to end in the browser. Through the API a demo
// sonographer (Lena Sorvik) submits three educational aorta exams and a reviewer scores
// them: two at an image quality that earns credit, one below it, each with a written
// comment. Then the QA lead opens Oversight → Roster, finds every demo sonographer, opens
// Lena's page and sees the reviewer's name on her reviewed exams, and on Reports downloads
// her credentialing report as PDF and as CSV.
//
// The files are checked with tools from outside the project: the PDF's text is extracted
// with pdftotext (Debian's poppler-utils) and the CSV is read with the csv-parse package
// (RFC 4180). Their figures are compared with what the screen showed and with GET
// /api/roster, the program's own answer, so a report that drifts from either fails.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { parse } from "csv-parse/sync";
import { expect, test } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD, scores, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const LEARNER = { email: "lena.sorvik@cedarhollow.example", name: "Lena Sorvik" };
const REVIEWER = { email: "reviewer@cedarhollow.example", name: "Imani Lindqvist" };
// The demo program's sonographers (seeds/demo.ts): everyone holding the sonographer role.
const DEMO_SONOGRAPHERS = ["Noa Hartwell", "Tobias Varga", "Lena Sorvik", "Amara Dunleavy"];
// Overall image quality per exam: the default credit rule needs 3 or more (shared/rubric/default-rubric.ts).
const QUALITY = ["4", "2", "5"];
const COMMENT = (i: number) => `Aorta practice scan ${i + 1}: sweep from the diaphragm to the bifurcation.`;

type Workspace = { assignment: { id: string }; exam: { id: string } };
type RosterRow = { id: string; name: string; applications: { code: string; credited: number; reviewed: number; threshold: number }[] };

test("the QA lead follows a sonographer from the roster to her page and downloads her credentialing report as PDF and CSV", async ({
  browser,
  baseURL,
}, testInfo) => {
  test.setTimeout(150_000);
  const base = baseURL!;
  const lead = await apiAs(base, LEAD);
  const learner = await apiAs(base, LEARNER.email);
  const reviewer = await apiAs(base, REVIEWER.email);
  const dir = fixtureDir();
  const { settings: before } = (await (await lead.get("/api/settings")).json()) as { settings: { doubleReadShare: number } };

  try {
    // Single reads only, so every exam is final after one review.
    expect((await lead.patch("/api/settings", { data: { doubleReadShare: 0 } })).ok()).toBeTruthy();

    const { applications } = (await (await learner.get("/api/applications")).json()) as { applications: { code: string; findings: { key: string }[] }[] };
    const aorta = applications.find((a) => a.code === "aorta")!;
    const reads = aorta.findings.map((f) => ({ key: f.key, read: "negative" }));
    const buffer = fs.readFileSync(h264Mp4(dir, "aorta.mp4", { seconds: 1, seed: 23 }));

    const examIds = await Promise.all(
      QUALITY.map(async (_, i) => {
        const created = await learner.post("/api/exams", {
          data: {
            applicationCode: "aorta",
            performedAt: new Date(Date.now() - (30 - i) * 60_000).toISOString(),
            setting: "educational",
            transducer: "curvilinear",
            preset: "Abdomen",
            indication: `Aorta practice ${i + 1}`,
            findings: reads,
          },
        });
        expect(created.status(), await created.text()).toBe(201);
        const { exam } = (await created.json()) as { exam: { id: string } };
        const upload = await learner.post(`/api/exams/${exam.id}/clips`, {
          multipart: { view: "longitudinal", file: { name: "aorta.mp4", mimeType: "video/mp4", buffer } },
        });
        expect(upload.status()).toBe(202);
        return exam.id;
      }),
    );
    for (const id of examIds) {
      await expect
        .poll(
          async () =>
            ((await (await learner.get(`/api/exams/${id}`)).json()) as { exam: { clips: { state: string }[] } }).exam.clips.map((c) => c.state).join(","),
          {
            timeout: 45_000,
          },
        )
        .toBe("ready");
      // Submitted one after another, so the queue (oldest first) hands them out in this order.
      expect((await learner.post(`/api/exams/${id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBeTruthy();
    }

    // The reviewer reads each: quality per QUALITY in the order claimed, with a comment.
    const mine = new Set(examIds);
    for (let i = 0; i < QUALITY.length; i++) {
      const res = await reviewer.post("/api/queue/next", { data: { application: "aorta" } });
      expect(res.status(), "an aorta read should be waiting").toBe(200);
      const ws = (await res.json()) as Workspace;
      expect(mine.has(ws.exam.id), "the claimed read is one of this test's exams").toBeTruthy();
      const review = await reviewer.post(`/api/assignments/${ws.assignment.id}/review`, { data: { scores: scores(QUALITY[i]), reads, feedback: COMMENT(i) } });
      expect(review.status(), await review.text()).toBe(201);
    }

    // The program's own answer, for comparing the screen and the files with.
    const roster = ((await (await lead.get("/api/roster")).json()) as { items: RosterRow[] }).items;
    const apiRow = roster.find((r) => r.name === LEARNER.name)!;
    const apiAorta = apiRow.applications.find((a) => a.code === "aorta")!;
    expect(apiAorta.reviewed).toBe(QUALITY.length);
    // Independent of the server's arithmetic: the exams at quality 3 or above.
    expect(apiAorta.credited).toBe(QUALITY.filter((q) => Number(q) >= 3).length);

    // --- The browser: Roster.
    const context = await browser.newContext({ acceptDownloads: true });
    const page = await context.newPage();
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(LEAD);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.getByRole("link", { name: "Roster" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Roster" })).toBeVisible();
    for (const name of DEMO_SONOGRAPHERS) await expect(page.getByRole("rowheader", { name: new RegExp(name) })).toBeVisible();

    const row = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: new RegExp(LEARNER.name) }) });
    const aortaLine = row.getByRole("listitem").filter({ hasText: "Abdominal aorta" });
    await expect(aortaLine).toContainText(`${apiAorta.credited}/${apiAorta.threshold}`);
    const shownText = (await aortaLine.innerText()).replace(/\s+/g, " ");
    const [, shownCredited, shownThreshold] = /(\d+)\/(\d+)/.exec(shownText)!;

    // Searching narrows the table to her.
    await page.getByLabel("Search by name or e-mail").fill("sorvik");
    await expect(page.getByRole("rowheader")).toHaveCount(1);
    await shot(page, testInfo, "roster");

    // --- Her page: what she sees, plus the reviewer's name.
    await row.getByRole("link", { name: LEARNER.name }).click();
    await expect(page.getByRole("heading", { level: 1, name: LEARNER.name })).toBeVisible();
    await expect(page).toHaveURL(new RegExp(`/oversight/roster/${apiRow.id}`));
    const exams = page.getByTestId("reviewed-exam");
    await expect(exams).toHaveCount(QUALITY.length);
    await expect(page.getByTestId("reviewer-name").first()).toContainText(REVIEWER.name);
    await expect(page.getByText(COMMENT(0))).toBeVisible();
    await expect(page.getByRole("heading", { name: /Learning curve: Abdominal aorta/ })).toBeVisible();
    await shot(page, testInfo, "sonographer");

    // --- Reports: her report as PDF, then as CSV, for all dates.
    await nav.getByRole("link", { name: "Reports" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Reports" })).toBeVisible();
    await page.getByLabel("One clinician").check();
    await page.getByLabel("Clinician", { exact: true }).selectOption({ label: LEARNER.name });
    await page.getByRole("button", { name: "All dates" }).click();
    await page.getByLabel("PDF", { exact: true }).check();

    const pdfDownload = page.waitForEvent("download");
    await page.getByRole("button", { name: "Download", exact: true }).click();
    const pdf = await pdfDownload;
    expect(pdf.suggestedFilename()).toMatch(/^credentialing-lena-sorvik-.*\.pdf$/);
    const pdfPath = path.join(dir, pdf.suggestedFilename());
    await pdf.saveAs(pdfPath);
    await expect(page.getByRole("status").filter({ hasText: "Report saved as" })).toContainText(pdf.suggestedFilename());
    expect(fs.readFileSync(pdfPath).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    // pdftotext (poppler-utils) reads the file as any PDF reader would; -layout keeps table rows on one line.
    const text = execFileSync("pdftotext", ["-layout", pdfPath, "-"], { encoding: "utf8" });
    expect(text).toContain(LEARNER.name);
    const aortaPdfLine = text.split("\n").find((l) => l.includes("Abdominal aorta") && /\d+\s*\/\s*\d+/.test(l));
    expect(aortaPdfLine, "the PDF's counts row for the aorta").toBeTruthy();
    // The same credited-of-threshold count as the roster showed on screen.
    expect(aortaPdfLine!).toMatch(new RegExp(`\\b${shownCredited}\\s*/\\s*${shownThreshold}\\b`));

    await page.getByLabel("CSV", { exact: true }).check();
    const csvDownload = page.waitForEvent("download");
    await page.getByRole("button", { name: "Download", exact: true }).click();
    const csv = await csvDownload;
    expect(csv.suggestedFilename()).toMatch(/^credentialing-lena-sorvik-.*\.csv$/);
    const csvPath = path.join(dir, csv.suggestedFilename());
    await csv.saveAs(csvPath);
    // csv-parse (RFC 4180) with the byte-order mark stripped, as a spreadsheet would read it.
    const records = parse(fs.readFileSync(csvPath), { bom: true }) as string[][];
    const [header, ...rows] = records;
    for (const column of ["clinician", "email", "application_code", "submitted", "reviewed", "credited", "threshold", "met"]) expect(header).toContain(column);
    const at = (r: string[], column: string) => r[header.indexOf(column)];
    const aortaRow = rows.find((r) => at(r, "clinician") === LEARNER.name && at(r, "application_code") === "aorta");
    expect(aortaRow, "the CSV row of her aorta exams").toBeTruthy();
    expect(Number(at(aortaRow!, "credited"))).toBe(apiAorta.credited);
    expect(Number(at(aortaRow!, "reviewed"))).toBe(apiAorta.reviewed);
    expect(
      rows.every((r) => at(r, "clinician") === LEARNER.name),
      "a one-clinician report holds only her rows",
    ).toBeTruthy();
    await shot(page, testInfo, "reports");
    await context.close();
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: before.doubleReadShare } });
    await Promise.all([lead.dispose(), learner.dispose(), reviewer.dispose()]);
    fs.rmSync(dir, { recursive: true, force: true });
  }
});

test("the QA lead sets the learning-curve rates, and the server's refusal of an unacceptable rate below the acceptable one shows next to the field", async ({
  browser,
  baseURL,
}) => {
  const lead = await apiAs(baseURL!, LEAD);
  const { settings: before } = (await (await lead.get("/api/settings")).json()) as { settings: Record<string, number> };
  const page = await (await browser.newContext()).newPage();
  try {
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(LEAD);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Program settings" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Program settings" })).toBeVisible();

    const acceptable = page.getByLabel("Acceptable failure rate (%)", { exact: true });
    const unacceptable = page.getByLabel("Unacceptable failure rate (%)", { exact: true });
    // The stored fractions appear as percentages.
    await expect(acceptable).toHaveValue(String(Math.round(before.cusumAcceptableRate * 1000) / 10));
    await expect(unacceptable).toHaveValue(String(Math.round(before.cusumUnacceptableRate * 1000) / 10));

    // Below the acceptable rate: the form sends it, the server refuses, the message sits by the field.
    await acceptable.fill("10");
    await unacceptable.fill("5");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(unacceptable).toHaveAttribute("aria-invalid", "true");
    await expect(unacceptable).toHaveAccessibleDescription(/must be above the acceptable failure rate/);
    const unchanged = ((await (await lead.get("/api/settings")).json()) as { settings: Record<string, number> }).settings;
    expect(unchanged.cusumUnacceptableRate).toBe(before.cusumUnacceptableRate);

    // A valid pair saves, stored as fractions.
    await unacceptable.fill("25");
    await page.getByLabel("False alarm chance, alpha (%)").fill("5");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(page.getByText("Settings saved.")).toBeVisible();
    const saved = ((await (await lead.get("/api/settings")).json()) as { settings: Record<string, number> }).settings;
    expect(saved.cusumAcceptableRate).toBeCloseTo(0.1, 10);
    expect(saved.cusumUnacceptableRate).toBeCloseTo(0.25, 10);
    expect(saved.cusumAlpha).toBeCloseTo(0.05, 10);
  } finally {
    const { cusumAcceptableRate, cusumUnacceptableRate, cusumAlpha, cusumBeta } = before;
    await lead.patch("/api/settings", { data: { cusumAcceptableRate, cusumUnacceptableRate, cusumAlpha, cusumBeta } });
    await page.context().close();
    await lead.dispose();
  }
});

test("a refused report download shows the server's own message", async ({ browser }) => {
  const page = await (await browser.newContext()).newPage();
  try {
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(LEAD);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    // A well-formed id that names nobody in the program: GET /api/reports/credentialing answers
    // 404 with a JSON error body instead of a file.
    await page.goto("/oversight/reports?userId=00000000-0000-4000-8000-000000000000&from=&to=");
    await expect(page.getByLabel("One clinician")).toBeChecked();
    let downloaded = false;
    page.on("download", () => (downloaded = true));
    await page.getByRole("button", { name: "Download", exact: true }).click();
    await expect(page.getByRole("alert")).toContainText("Clinician not found");
    expect(downloaded).toBe(false);
  } finally {
    await page.context().close();
  }
});
