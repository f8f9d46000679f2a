// The credentialing report read back with general tools: the PDF's text through pdftotext and
// its fonts through pdffonts (Debian's poppler-utils), the CSV through csv-parse. Expected
// figures are worked out here from the counts (Wilson intervals via shared/stats, CUSUM
// signals by hand), and one interval is checked against a published value.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { parse } from "csv-parse/sync";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CREDENTIALING_CAUTION, type Progress } from "../../shared/schemas/progress";
import { wilsonInterval } from "../../shared/stats/wilson";
import { credentialingFileName, renderCredentialingCsv, renderCredentialingPdf, type CredentialingReportData } from "./credentialing";
import { accuracy, application, outcomes, progress, PROGRAM, zdenka } from "./credentialing.fixture";

let dir: string;
beforeAll(() => {
  // Fail loudly rather than skip: without poppler-utils nothing here is checked.
  for (const tool of ["pdftotext", "pdffonts"]) {
    try {
      execFileSync(tool, ["-v"], { stdio: "ignore" });
    } catch {
      throw new Error(`${tool} is missing: install Debian's poppler-utils (scripts/ensure-deps.sh --test)`);
    }
  }
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-report-"));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let fileNo = 0;
function writePdf(pdf: Buffer): string {
  const file = path.join(dir, `report-${++fileNo}.pdf`);
  fs.writeFileSync(file, pdf);
  return file;
}
const pdfText = (file: string) => execFileSync("pdftotext", ["-layout", "-enc", "UTF-8", file, "-"], { encoding: "utf8" });
const pdfFonts = (file: string) => execFileSync("pdffonts", [file], { encoding: "utf8" });
/** Text with every run of white space made one space (pdftotext -layout pads columns). */
const flat = (s: string) => s.replace(/\s+/g, " ");
const esc = (s: string) => s.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&");
/** A table row: the cells in order, any spacing between them. */
const row = (...cells: string[]) => new RegExp(cells.map(esc).join("\\s+"));

/** "85% (66–94%, n = 26)" worked out from the counts with the Wilson (1927) score interval. */
function expectedRate(x: number, n: number): string {
  const [lo, hi] = wilsonInterval(x, n);
  return `${Math.round((x / n) * 100)}% (${Math.round(lo * 100)}–${Math.round(hi * 100)}%, n = ${n})`;
}

const generatedAt = new Date("2026-11-03T14:05:00Z");
const range = { from: "2026-01-01", to: "2026-12-31" };
const one = (p: Progress): CredentialingReportData => ({ programName: PROGRAM, generatedAt, range, scope: "sonographer", sonographers: [p] });

describe("credentialing report PDF, one sonographer", () => {
  let text: string;
  let fonts: string;
  beforeAll(async () => {
    const file = writePdf(await renderCredentialingPdf(one(zdenka())));
    text = pdfText(file);
    fonts = pdfFonts(file);
  });

  it("names the report, the program, the person, the dates and when it was made", () => {
    expect(text).toContain("Credentialing report");
    expect(text).toContain(PROGRAM);
    // ř and š come from the latin-ext subset of the font, the rest from latin.
    expect(text).toContain("Zdenka Hořejší");
    expect(text).toContain("zdenka.horejsi@cedarhollow.example");
    expect(text).toMatch(row("Dates", "2026-01-01 to 2026-12-31"));
    expect(text).toContain("2026-11-03 14:05 UTC");
  });

  it("prints counts per application against the threshold with the credit rate and its Wilson interval", () => {
    expect(text).toMatch(row("Trauma (FAST / eFAST)", "30", "26", "22 / 25", "Not met, 3 to go", expectedRate(22, 26)));
    expect(text).toMatch(row("Focused cardiac", "12", "10", "5 / 25", "Not met, 20 to go", expectedRate(5, 10)));
    expect(text).toMatch(row("Ocular", "0", "0", "0 / 25", "Not met, 25 to go", "—"));
    expect(text).toMatch(row("Procedural guidance", "263", "263", "81 / 50", "Met", expectedRate(81, 263)));
    expect(text).toMatch(row("All applications", "308", "301", "110", "1 of 5 met"));
  });

  it("agrees with a published Wilson interval: 81/263 gives 0.2553 to 0.3662", () => {
    // Newcombe RG (1998) Stat Med 17:857–872, Table I, method 3 (score interval without
    // continuity correction), example 81/263 — values quoted from memory, and the same ones
    // shared/stats/wilson.test.ts checks to four decimals. Printed as whole percentages.
    expect(text).toContain(`31% (${Math.round(25.53)}–${Math.round(36.62)}%, n = 263)`);
  });

  it("prints the quality distribution per level", () => {
    expect(text).toMatch(row("Trauma (FAST / eFAST)", "1", "3", "8", "10", "4", "26"));
    expect(text).toMatch(row("Procedural guidance", "0", "182", "81", "0", "0", "263"));
  });

  it("prints accuracy against the reviewer: sensitivity, specificity, PPV and NPV with intervals and n", () => {
    // TP 20, FP 3, TN 40, FN 2: sensitivity 20/22, specificity 40/43, PPV 20/23, NPV 40/42.
    expect(text).toMatch(row("Trauma (FAST / eFAST)", expectedRate(20, 22), expectedRate(40, 43), expectedRate(20, 23), expectedRate(40, 42)));
    expect(text).toContain("TP 20 · FP 3 · TN 40 · FN 2 · 1 indeterminate left out");
    expect(text).toMatch(row("Focused cardiac", expectedRate(3, 4), expectedRate(10, 12), expectedRate(3, 5), expectedRate(10, 11)));
  });

  it("prints accuracy against confirmatory results separately, with a dash where n = 0", () => {
    // TP 5, FP 1, TN 7, FN 0: 5/5, 7/8, 5/6, 7/7.
    expect(text).toMatch(row("Trauma (FAST / eFAST)", expectedRate(5, 5), expectedRate(7, 8), expectedRate(5, 6), expectedRate(7, 7)));
    expect(text).toContain("confirmed by CT 8, Clinical follow-up 5");
    expect(text).toMatch(row("Focused cardiac", "—", "—", "—", "—"));
    expect(text).toContain("No confirmatory results entered");
  });

  it("states the learning-curve result per application with p0, p1, alpha and beta", () => {
    // Worked by hand from Wald's limits (shared/stats/cusum.ts). Trauma: p0 0.2, p1 0.4,
    // alpha 0.05, beta 0.2 → s = ln(4/3)/ln(8/3) = 0.2933, h0 = −ln(4.75)/ln(8/3) = −1.589,
    // h1 = ln(16)/ln(8/3) = 2.827. Failures at attempts 2, 5, 9 and 14, so after k ≥ 14
    // attempts the path is 4 − 0.2933k, which first reaches −1.589 at k = 20 (2026-09-20).
    expect(text).toMatch(row("Trauma (FAST / eFAST)", "acceptable rate reached at attempt 20 (2026-09-20)", "0.2", "0.4", "0.05", "0.2", "−1.59 / 2.83"));
    // Cardiac: p0 0.1, p1 0.2, alpha = beta = 0.1 → 1 − s = 0.8548, h1 = ln 9 / ln 2.25 = 2.710;
    // four failures in a row: 2.564 after three, 3.419 after four.
    expect(text).toMatch(row("Focused cardiac", "unacceptable signalled at attempt 4 (2026-09-04)", "0.1", "0.2", "0.1", "0.1", "−2.71 / 2.71"));
    expect(text).toMatch(row("Lung", "no signal yet after 2 attempts"));
  });

  it("leaves applications without exams out of the detail tables", () => {
    expect(text.match(/Ocular/g)).toHaveLength(1);
  });

  it("has a signature block for the program director", () => {
    expect(text).toContain("Program director review");
    expect(text).toMatch(row("Program director name", "Program director signature", "Date"));
  });

  it("puts the caution and the page number in the footer of every page", () => {
    const pages = text.split("\f").filter((p) => p.trim());
    expect(pages.length).toBeGreaterThanOrEqual(2);
    pages.forEach((page, i) => {
      expect(flat(page)).toContain(CREDENTIALING_CAUTION);
      expect(page).toContain(`Page ${i + 1} of ${pages.length}`);
    });
  });

  it("embeds Noto Sans (regular and bold) and uses no standard PDF font", () => {
    expect(fonts).toMatch(/\+NotoSans-Regular\s+CID TrueType\s+Identity-H\s+yes\s+yes\s+yes/);
    expect(fonts).toMatch(/\+NotoSans-Bold\s+CID TrueType\s+Identity-H\s+yes\s+yes\s+yes/);
    const rows = fonts
      .split("\n")
      .slice(2)
      .filter((l) => l.trim());
    expect(rows.length).toBeGreaterThanOrEqual(2);
    for (const r of rows) expect(r).toMatch(/NotoSans-(Regular|Bold)\s+CID TrueType\s+Identity-H\s+yes/);
    expect(fonts).not.toMatch(/Helvetica|Times|Courier/);
  });

  it("says 'all dates' when the range is open", async () => {
    const file = writePdf(await renderCredentialingPdf({ ...one(zdenka()), range: { from: null, to: null } }));
    expect(pdfText(file)).toMatch(row("Dates", "all dates"));
  });
});

function ansel(): Progress {
  return progress("Ansel Marchetti-Oyelaran", "ansel.mo@cedarhollow.example", [
    application({ code: "efast", name: "Trauma (FAST / eFAST)", submitted: 4, outcomes: outcomes(4, [1]), quality: { "3": 4 } }),
    application({ code: "cardiac", name: "Focused cardiac", submitted: 0, outcomes: [] }),
    application({ code: "lung", name: "Lung", submitted: 7, outcomes: outcomes(6, []), quality: { "5": 6 }, reviewer: accuracy(2, 0, 4, 0) }),
    application({ code: "ocular", name: "Ocular", submitted: 0, outcomes: [] }),
    application({ code: "procedure", name: "Procedural guidance", submitted: 0, threshold: 50, outcomes: [] }),
  ]);
}

describe("credentialing report PDF, whole program", () => {
  it("starts with a program summary and gives each sonographer their own pages", async () => {
    const data: CredentialingReportData = { programName: PROGRAM, generatedAt, range, scope: "program", sonographers: [zdenka(), ansel()] };
    const pages = pdfText(writePdf(await renderCredentialingPdf(data)))
      .split("\f")
      .filter((p) => p.trim());
    expect(pages[0]).toContain("Program summary");
    expect(pages[0]).toMatch(row("Zdenka Hořejší", "zdenka.horejsi@cedarhollow.example", "308", "301", "110", "1 of 5"));
    expect(pages[0]).toMatch(row("Ansel Marchetti-Oyelaran", "ansel.mo@cedarhollow.example", "11", "10", "9", "0 of 5"));
    // Per application across the program: Lung 3 + 7 submitted, 2 + 6 reviewed and credited.
    expect(pages[0]).toMatch(row("Lung", "10", "8", "8", "0 of 2"));
    expect(pages[0]).toContain("Program director signature");
    const starts = (name: string) => pages.findIndex((p) => new RegExp(`^\\s*Credentialing report[\\s\\S]*${row("Clinician", name).source}`).test(p));
    expect(starts("Zdenka Hořejší")).toBe(1);
    expect(starts("Ansel Marchetti-Oyelaran")).toBeGreaterThan(1);
    expect(pages[starts("Ansel Marchetti-Oyelaran")]).toMatch(row("Lung", "7", "6", "6 / 25", "Not met, 19 to go", expectedRate(6, 6)));
    pages.forEach((p, i) => {
      expect(flat(p)).toContain(CREDENTIALING_CAUTION);
      expect(p).toContain(`Page ${i + 1} of ${pages.length}`);
    });
  });

  // Speed lives in `npm run bench:report`; this checks a 60-person program report is whole.
  it("renders a program report of 60 sonographers, one section each", async () => {
    const people = Array.from({ length: 60 }, (_, i) => {
      const p = i % 2 ? zdenka() : ansel();
      return { ...p, sonographer: { ...p.sonographer, name: `Learner ${i + 1} Testperson`, email: `learner${i + 1}@cedarhollow.example` } };
    });
    const data: CredentialingReportData = { programName: PROGRAM, generatedAt, range, scope: "program", sonographers: people };
    const pdf = await renderCredentialingPdf(data);
    const pages = pdfText(writePdf(pdf))
      .split("\f")
      .filter((p) => p.trim());
    expect(pages.filter((p) => /^\s*Credentialing report/.test(p) && /Clinician\s+Learner \d+ Testperson/.test(p))).toHaveLength(60);
  });
});

describe("credentialing report CSV", () => {
  const read = (csv: string) => parse(csv, { bom: true, columns: true, skip_empty_lines: true }) as Record<string, string>[];

  it("has one row per sonographer and application under clear headers", () => {
    const csv = renderCredentialingCsv({ programName: PROGRAM, generatedAt, range, scope: "program", sonographers: [zdenka(), ansel()] });
    const header = (parse(csv, { bom: true, to_line: 1 }) as string[][])[0];
    const acc = (ref: string) => [
      ...["tp", "fp", "tn", "fn", "indeterminate"].map((k) => `${ref}_${k}`),
      ...["sensitivity", "specificity", "ppv", "npv"].flatMap((m) => [`${ref}_${m}`, `${ref}_${m}_n`, `${ref}_${m}_ci_low`, `${ref}_${m}_ci_high`]),
    ];
    expect(header).toEqual([
      "program",
      "clinician",
      "email",
      "application_code",
      "application",
      "from",
      "to",
      "submitted",
      "reviewed",
      "credited",
      "threshold",
      "met",
      "remaining",
      "credit_rate",
      "credit_rate_ci_low",
      "credit_rate_ci_high",
      "quality_1",
      "quality_2",
      "quality_3",
      "quality_4",
      "quality_5",
      ...acc("reviewer"),
      ...acc("confirmatory"),
      "cusum_attempts",
      "cusum_signal",
      "cusum_signal_attempt",
      "cusum_signal_date",
      "cusum_p0",
      "cusum_p1",
      "cusum_alpha",
      "cusum_beta",
      "counted",
      "credited_clinical",
      "credited_educational",
      "credited_simulated",
      "positives",
      "limited",
      "rule_non_clinical_cap",
      "rule_min_positive",
      "rule_require_complete",
      "indeterminate_rate",
      "credit_rule",
    ]);
    const rows = read(csv);
    expect(rows).toHaveLength(10);
    expect(csv.startsWith("\ufeff")).toBe(true);
    expect(csv).toContain("\r\n");

    const efast = rows.find((r) => r.clinician === "Zdenka Hořejší" && r.application_code === "efast")!;
    const [lo, hi] = wilsonInterval(22, 26);
    expect(efast).toMatchObject({
      program: PROGRAM,
      email: "zdenka.horejsi@cedarhollow.example",
      application: "Trauma (FAST / eFAST)",
      from: "2026-01-01",
      to: "2026-12-31",
      submitted: "30",
      reviewed: "26",
      credited: "22",
      threshold: "25",
      met: "no",
      remaining: "3",
      credit_rate: (22 / 26).toFixed(4),
      credit_rate_ci_low: lo.toFixed(4),
      credit_rate_ci_high: hi.toFixed(4),
      quality_1: "1",
      quality_3: "8",
      quality_5: "4",
      reviewer_tp: "20",
      reviewer_indeterminate: "1",
      reviewer_sensitivity: (20 / 22).toFixed(4),
      reviewer_sensitivity_n: "22",
      reviewer_sensitivity_ci_low: wilsonInterval(20, 22)[0].toFixed(4),
      reviewer_npv_ci_high: wilsonInterval(40, 42)[1].toFixed(4),
      confirmatory_sensitivity: "1.0000",
      confirmatory_sensitivity_ci_high: "1.0000",
      confirmatory_specificity: (7 / 8).toFixed(4),
      cusum_attempts: "26",
      // See the hand calculation in the PDF test above.
      cusum_signal: "competent",
      cusum_signal_attempt: "20",
      cusum_signal_date: "2026-09-20",
      cusum_p0: "0.2",
      cusum_p1: "0.4",
      cusum_alpha: "0.05",
      cusum_beta: "0.2",
    });

    // Newcombe (1998) Stat Med 17:857, Table I, method 3, 81/263: 0.2553–0.3662 (from memory).
    const procedure = rows.find((r) => r.clinician === "Zdenka Hořejší" && r.application_code === "procedure")!;
    expect(procedure).toMatchObject({ credit_rate: "0.3080", credit_rate_ci_low: "0.2553", credit_rate_ci_high: "0.3662", met: "yes" });

    // Nothing to count: empty rate cells, n = 0, no signal.
    const ocular = rows.find((r) => r.clinician === "Zdenka Hořejší" && r.application_code === "ocular")!;
    expect(ocular).toMatchObject({
      credit_rate: "",
      credit_rate_ci_low: "",
      reviewer_ppv: "",
      reviewer_ppv_n: "0",
      reviewer_ppv_ci_low: "",
      cusum_signal: "none",
      cusum_signal_attempt: "",
      cusum_attempts: "0",
    });
    const cardiac = rows.find((r) => r.clinician === "Zdenka Hořejší" && r.application_code === "cardiac")!;
    expect(cardiac).toMatchObject({ cusum_signal: "unacceptable", cusum_signal_attempt: "4", cusum_signal_date: "2026-09-04" });

    // Plain decimals: proportions 0–1 with four decimals, counts as integers.
    for (const r of rows) {
      for (const [k, v] of Object.entries(r)) {
        if (/(_rate|_ci_low|_ci_high|_sensitivity|_specificity|_ppv|_npv)$/.test(k)) expect(v, k).toMatch(/^$|^[01]\.\d{4}$/);
        if (/^(submitted|reviewed|credited|threshold|remaining|quality_\d|.*_n|.*_tp|.*_fp|.*_tn|.*_fn|cusum_attempts)$/.test(k)) expect(v, k).toMatch(/^\d+$/);
      }
    }
  });

  it("leaves open dates empty", () => {
    const rows = read(renderCredentialingCsv({ ...one(zdenka()), range: { from: null, to: "2026-06-30" } }));
    expect(rows[0]).toMatchObject({ from: "", to: "2026-06-30" });
  });

  it("defuses names a spreadsheet would run as formulas and keeps commas and quotes intact", () => {
    const named = (name: string, email = "someone@cedarhollow.example") => ({ ...ansel(), sonographer: { ...ansel().sonographer, name, email } });
    const csv = renderCredentialingCsv({
      programName: "=Program",
      generatedAt,
      range,
      scope: "program",
      sonographers: [
        named('=HYPERLINK("http://evil.example")'),
        named("+Ada Plus"),
        named("-Dana Minus"),
        named("@Ira At", "@odd@cedarhollow.example"),
        named('Quinn "Q" O\'Hara, Jr.'),
      ],
    });
    const names = [...new Set(read(csv).map((r) => r.clinician))];
    expect(names).toEqual(['\'=HYPERLINK("http://evil.example")', "'+Ada Plus", "'-Dana Minus", "'@Ira At", 'Quinn "Q" O\'Hara, Jr.']);
    expect(read(csv).every((r) => r.program === "'=Program")).toBe(true);
    expect(read(csv).find((r) => r.clinician === "'@Ira At")!.email).toBe("'@odd@cedarhollow.example");
    // No raw field anywhere starts with a formula character.
    for (const fields of parse(csv, { bom: true }) as string[][]) for (const f of fields) expect(f).not.toMatch(/^[=+\-@]/);
  });
});

describe("credentialingFileName", () => {
  it("names the person or the program and the range, in plain ASCII", () => {
    expect(credentialingFileName(one(zdenka()), "pdf")).toBe("credentialing-zdenka-horejsi-2026-01-01-to-2026-12-31.pdf");
    expect(credentialingFileName({ ...one(zdenka()), scope: "program", range: { from: null, to: null } }, "csv")).toBe(
      "credentialing-cedar-hollow-emergency-medicine-all-dates.csv",
    );
    expect(credentialingFileName({ ...one(zdenka()), range: { from: "2026-03-01", to: null } }, "csv")).toBe(
      "credentialing-zdenka-horejsi-from-2026-03-01.csv",
    );
  });
});
