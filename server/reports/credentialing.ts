// The credentialing report (README "Progress and credentialing", "Report"): one sonographer's or a whole
// program's progress for a date range, as a PDF for the program director to sign and as a
// CSV for spreadsheets. Pure renderers of Progress values; the route gathers the data.
// Layout primitives and the shipped font live in ./pdf-pager.
import PDFDocument from "pdfkit";
import { stringify } from "csv-stringify/sync";
import {
  CONFIRMATION_METHOD_LABELS,
  CREDENTIALING_CAUTION,
  type Accuracy,
  type ApplicationProgress,
  type ConfirmationMethod,
  type CusumView,
  type Progress,
  type Rate,
} from "../../shared/schemas/progress";
import { COLOUR, CONTENT_WIDTH, loadFonts, PAGE, Pager, type Column, type Row } from "./pdf-pager";

export interface CredentialingReportData {
  programName: string;
  generatedAt: Date;
  range: { from: string | null; to: string | null };
  /** "sonographer" = one person's report; "program" = every sonographer of the program. */
  scope: "sonographer" | "program";
  sonographers: Progress[];
}

// ---------------------------------------------------------------------------------------
// Wording shared by the PDF and the CSV

const QUALITY_LEVELS = ["1", "2", "3", "4", "5"] as const;
const MEASURES = ["sensitivity", "specificity", "ppv", "npv"] as const;
const MEASURE_LABELS: Record<(typeof MEASURES)[number], string> = { sensitivity: "Sensitivity", specificity: "Specificity", ppv: "PPV", npv: "NPV" };

/** A whole percentage that never shows 0% or 100% unless every count is a failure or a success. */
function percent(successes: number, n: number): number {
  if (successes === 0) return 0;
  if (successes === n) return 100;
  return Math.min(99, Math.max(1, Math.round((successes / n) * 100)));
}

/** "87% (72–95%, n = 23)": the rate, its Wilson 95% interval and the count; "—" when n = 0. */
export function formatRate(r: Rate): string {
  if (r.n === 0 || r.value === null) return "—";
  const [lo, hi] = r.ci95;
  return `${percent(r.successes, r.n)}% (${Math.round(lo * 100)}–${Math.round(hi * 100)}%, n = ${r.n})`;
}

/** The learning-curve result as a sentence fragment ("acceptable rate reached at attempt 18 (2026-10-02)"); a statistical signal, not a certification. */
export function cusumSentence(c: CusumView): string {
  if (c.signal === "none" || c.signalAtAttempt === null) {
    const n = c.points.length;
    return `no signal yet after ${n} ${n === 1 ? "attempt" : "attempts"}`;
  }
  const date = c.signalAtDate ? ` (${c.signalAtDate.slice(0, 10)})` : "";
  return `${c.signal === "competent" ? "acceptable rate reached" : "unacceptable signalled"} at attempt ${c.signalAtAttempt}${date}`;
}

/** "all dates", "2026-01-01 to 2026-06-30", "from 2026-01-01" or "up to 2026-06-30". */
export function formatRange(range: CredentialingReportData["range"]): string {
  if (range.from && range.to) return `${range.from} to ${range.to}`;
  if (range.from) return `from ${range.from}`;
  if (range.to) return `up to ${range.to}`;
  return "all dates";
}

function formatGenerated(d: Date): string {
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** A setting such as p0 = 0.1 printed without trailing zeros. */
function formatParameter(x: number): string {
  return String(Number(x.toFixed(4)));
}

function formatLimit(x: number): string {
  // U+2212 minus: a hyphen looks like a dash beside other numbers.
  return (x < 0 ? "\u2212" : "") + Math.abs(x).toFixed(2);
}

/** Applications with anything in the range; the detail tables leave the others out. */
function isActive(a: ApplicationProgress): boolean {
  return a.submitted > 0 || a.reviewed > 0 || a.cusum.points.length > 0;
}

function qualityCount(a: ApplicationProgress, level: string): number {
  return a.qualityDistribution[level] ?? 0;
}

function slug(s: string): string {
  const out = s
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 60)
    .replace(/-+$/, "");
  return out || "report";
}

/**
 * An ASCII-only download name: "credentialing-<person or program>-<range>.<format>", safe in
 * a Content-Disposition header without encoding.
 */
export function credentialingFileName(data: CredentialingReportData, format: "pdf" | "csv"): string {
  const who = data.scope === "sonographer" && data.sonographers[0] ? data.sonographers[0].sonographer.name : data.programName;
  const { from, to } = data.range;
  const when = from && to ? `${from}-to-${to}` : from ? `from-${from}` : to ? `to-${to}` : "all-dates";
  return `credentialing-${slug(who)}-${when}.${format}`;
}

// ---------------------------------------------------------------------------------------
// CSV

/** Defuses a cell a spreadsheet would run as a formula (CSV injection) with a leading quote. */
export function guardCell(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

const proportion = (x: number | null) => (x === null ? "" : x.toFixed(4));

function rateCells(r: Rate): string[] {
  // An empty interval for n = 0: [0, 1] is true but says nothing in a spreadsheet.
  if (r.n === 0 || r.value === null) return ["", "0", "", ""];
  return [proportion(r.value), String(r.n), proportion(r.ci95[0]), proportion(r.ci95[1])];
}

function accuracyColumns(prefix: string): string[] {
  return [
    ...["tp", "fp", "tn", "fn", "indeterminate"].map((k) => `${prefix}_${k}`),
    ...MEASURES.flatMap((m) => [`${prefix}_${m}`, `${prefix}_${m}_n`, `${prefix}_${m}_ci_low`, `${prefix}_${m}_ci_high`]),
  ];
}

function accuracyCells(a: Accuracy): string[] {
  return [...[a.tp, a.fp, a.tn, a.fn, a.indeterminate].map(String), ...MEASURES.flatMap((m) => rateCells(a[m]))];
}

/** Column names of the credentialing CSV, in order. */
export const CREDENTIALING_CSV_COLUMNS: readonly string[] = [
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
  ...QUALITY_LEVELS.map((q) => `quality_${q}`),
  ...accuracyColumns("reviewer"),
  ...accuracyColumns("confirmatory"),
  "cusum_attempts",
  "cusum_signal",
  "cusum_signal_attempt",
  "cusum_signal_date",
  "cusum_p0",
  "cusum_p1",
  "cusum_alpha",
  "cusum_beta",
  // The application's credit rule as applied, and the counts it decides on.
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
];

/**
 * The report as CSV: one row per sonographer and application, proportions as 0–1 with four
 * decimals, CRLF line ends, and a leading byte-order mark so spreadsheets read UTF-8 names.
 */
export function renderCredentialingCsv(data: CredentialingReportData): string {
  const rows: string[][] = [];
  for (const p of data.sonographers) {
    for (const a of p.applications) {
      const credit =
        a.creditRate.n === 0 || a.creditRate.value === null ? ["", "", ""] : [proportion(a.creditRate.value), ...a.creditRate.ci95.map(proportion)];
      rows.push([
        guardCell(data.programName),
        guardCell(p.sonographer.name),
        guardCell(p.sonographer.email),
        guardCell(a.application.code),
        guardCell(a.application.name),
        data.range.from ?? "",
        data.range.to ?? "",
        String(a.submitted),
        String(a.reviewed),
        String(a.credited),
        String(a.threshold),
        a.met ? "yes" : "no",
        String(a.remaining),
        ...credit,
        ...QUALITY_LEVELS.map((q) => String(qualityCount(a, q))),
        ...accuracyCells(a.accuracyVsReviewer),
        ...accuracyCells(a.accuracyVsConfirmatory),
        String(a.cusum.points.length),
        a.cusum.signal,
        a.cusum.signalAtAttempt === null ? "" : String(a.cusum.signalAtAttempt),
        a.cusum.signalAtDate ? a.cusum.signalAtDate.slice(0, 10) : "",
        formatParameter(a.cusum.p0),
        formatParameter(a.cusum.p1),
        formatParameter(a.cusum.alpha),
        formatParameter(a.cusum.beta),
        String(a.counted),
        String(a.creditedBySetting.clinical),
        String(a.creditedBySetting.educational),
        String(a.creditedBySetting.simulated),
        String(a.positives),
        String(a.limited),
        a.creditRule.nonClinicalCap === null ? "" : String(a.creditRule.nonClinicalCap),
        String(a.creditRule.minPositive),
        a.creditRule.requireComplete ? "yes" : "no",
        a.indeterminateRate.value === null ? "" : proportion(a.indeterminateRate.value),
        guardCell(a.creditRuleText),
      ]);
    }
  }
  return "\ufeff" + stringify([[...CREDENTIALING_CSV_COLUMNS], ...rows], { record_delimiter: "windows" });
}

const APP_COL = 110;

function countsTable(pg: Pager, p: Progress) {
  const columns: Column[] = [
    { header: "Application", width: APP_COL },
    { header: "Submitted", width: 50, align: "right" },
    { header: "Reviewed", width: 50, align: "right" },
    { header: "Credited / threshold", width: 65, align: "right" },
    { header: "Status", width: 85 },
    { header: "Credit rate (95% CI)", width: CONTENT_WIDTH - APP_COL - 50 - 50 - 65 - 85 },
  ];
  const rows: Row[] = p.applications.map((a) => ({
    cells: [
      a.application.name,
      String(a.submitted),
      String(a.reviewed),
      `${a.credited} / ${a.threshold}`,
      a.met ? "Met" : `Not met, ${a.remaining} to go`,
      formatRate(a.creditRate),
    ],
  }));
  rows.push({
    bold: true,
    cells: [
      "All applications",
      String(p.total.submitted),
      String(p.total.reviewed),
      String(p.total.credited),
      `${p.total.applicationsMet} of ${p.total.applications} met`,
      "",
    ],
  });
  pg.table(columns, rows);
}

function qualityTable(pg: Pager, apps: ApplicationProgress[]) {
  const w = (CONTENT_WIDTH - APP_COL - 70) / 5;
  const columns: Column[] = [
    { header: "Application", width: APP_COL },
    ...QUALITY_LEVELS.map((q) => ({ header: `Level ${q}`, width: w, align: "right" as const })),
    { header: "Rated exams", width: 70, align: "right" },
  ];
  pg.table(
    columns,
    apps.map((a) => {
      const counts = QUALITY_LEVELS.map((q) => qualityCount(a, q));
      return { cells: [a.application.name, ...counts.map(String), String(counts.reduce((s, c) => s + c, 0))] };
    }),
  );
}

function accuracyTable(
  pg: Pager,
  apps: ApplicationProgress[],
  pick: (a: ApplicationProgress) => Accuracy,
  none: string,
  extra?: (a: ApplicationProgress) => string,
) {
  // A narrower name column leaves room for "100% (98–100%, n = 182)".
  const w = (CONTENT_WIDTH - 95) / 4;
  const columns: Column[] = [{ header: "Application", width: 95 }, ...MEASURES.map((m) => ({ header: MEASURE_LABELS[m], width: w }))];
  pg.table(
    columns,
    apps.map((a) => {
      const acc = pick(a);
      const compared = acc.tp + acc.fp + acc.tn + acc.fn + acc.indeterminate;
      const counts =
        compared === 0
          ? none
          : `TP ${acc.tp} · FP ${acc.fp} · TN ${acc.tn} · FN ${acc.fn}` + (acc.indeterminate > 0 ? ` · ${acc.indeterminate} indeterminate left out` : "");
      const more = extra?.(a);
      return { cells: [a.application.name, ...MEASURES.map((m) => formatRate(acc[m]))], note: more ? `${counts} · ${more}` : counts };
    }),
  );
}

function byMethod(a: ApplicationProgress): string {
  const parts = (Object.entries(a.accuracyVsConfirmatory.byMethod) as [ConfirmationMethod, number][])
    .filter(([, n]) => n > 0)
    .map(([m, n]) => `${CONFIRMATION_METHOD_LABELS[m]} ${n}`);
  return parts.length ? `confirmed by ${parts.join(", ")}` : "";
}

function cusumTable(pg: Pager, apps: ApplicationProgress[]) {
  const columns: Column[] = [
    { header: "Application", width: APP_COL },
    { header: "Result", width: 200 },
    { header: "p0", width: 30, align: "right" },
    { header: "p1", width: 30, align: "right" },
    { header: "alpha", width: 35, align: "right" },
    { header: "beta", width: 35, align: "right" },
    { header: "Limits h0 / h1", width: CONTENT_WIDTH - APP_COL - 200 - 30 - 30 - 35 - 35, align: "right" },
  ];
  pg.table(
    columns,
    apps.map((a) => ({
      cells: [
        a.application.name,
        cusumSentence(a.cusum),
        formatParameter(a.cusum.p0),
        formatParameter(a.cusum.p1),
        formatParameter(a.cusum.alpha),
        formatParameter(a.cusum.beta),
        `${formatLimit(a.cusum.h0)} / ${formatLimit(a.cusum.h1)}`,
      ],
    })),
  );
}

function sonographerSection(pg: Pager, data: CredentialingReportData, p: Progress) {
  pg.continuation = `Credentialing report · ${data.programName} · ${p.sonographer.name} (continued)`;
  const s = p.settings;
  pg.titleBlock(data.programName, [
    ["Clinician", p.sonographer.name],
    ["E-mail", p.sonographer.email],
    ["Dates", formatRange(data.range)],
    ["Generated", formatGenerated(data.generatedAt)],
    ["Credit rule", `per application, stated under the counts (program default: ${s.threshold} credited exams)`],
  ]);

  pg.sectionTitle("Exams per application");
  countsTable(pg, p);
  pg.sectionTitle("Credit rule applied");
  for (const a of p.applications.filter(isActive)) {
    const bySetting = a.creditedBySetting;
    pg.paragraph(
      `${a.application.name}: ${a.creditRuleText} Counted ${a.counted} of ${a.threshold} (credited: ${bySetting.clinical} clinical, ${bySetting.educational} educational, ${bySetting.simulated} simulated; ${a.positives} with a positive finding; ${a.limited} technically limited). Indeterminate reads: ${a.indeterminateRate.value === null ? "none read" : `${Math.round(a.indeterminateRate.value * 100)} %`}.`,
      { size: 8.5 },
    );
  }

  const active = p.applications.filter(isActive);
  if (active.length === 0) {
    pg.paragraph("No exams in this date range: the detail tables are left out.", { size: 8.5, color: COLOUR.muted });
  } else {
    if (active.length < p.applications.length) {
      pg.paragraph("The tables below list only the applications with exams in this date range.", { size: 8, color: COLOUR.muted }, 0);
    }
    pg.sectionTitle("Overall image quality (exams per level, 1 lowest to 5 highest)");
    qualityTable(pg, active);
    pg.sectionTitle("Accuracy against the reviewer's reads (Wilson 95% intervals)");
    accuracyTable(pg, active, (a) => a.accuracyVsReviewer, "No finding reads compared yet");
    pg.sectionTitle("Accuracy against confirmatory results (Wilson 95% intervals)");
    accuracyTable(pg, active, (a) => a.accuracyVsConfirmatory, "No confirmatory results entered", byMethod);
    pg.sectionTitle("Learning curve (CUSUM; failure = a reviewed exam without credit)");
    cusumTable(pg, active);
  }

  pg.signatureBlock(`I have reviewed this record of ${p.sonographer.name}'s exams (${formatRange(data.range)}).`);
}

function programSummary(pg: Pager, data: CredentialingReportData) {
  pg.continuation = `Credentialing report · ${data.programName} · program summary (continued)`;
  pg.titleBlock(data.programName, [
    ["Program", data.programName],
    ["Clinicians", String(data.sonographers.length)],
    ["Dates", formatRange(data.range)],
    ["Generated", formatGenerated(data.generatedAt)],
  ]);
  pg.sectionTitle("Program summary");
  if (data.sonographers.length === 0) {
    pg.paragraph("No clinicians in this program.", { size: 8.5, color: COLOUR.muted });
  } else {
    const columns: Column[] = [
      { header: "Clinician", width: 112 },
      { header: "E-mail", width: 129 },
      { header: "Submitted", width: 50, align: "right" },
      { header: "Reviewed", width: 48, align: "right" },
      { header: "Credited", width: 45, align: "right" },
      { header: "Applications met", width: 56, align: "right" },
      { header: "Acceptable rate reached", width: 55, align: "right" },
    ];
    const signalled = (p: Progress) => p.applications.filter((a) => a.cusum.signal === "competent").length;
    pg.table(
      columns,
      data.sonographers.map((p) => ({
        cells: [
          p.sonographer.name,
          p.sonographer.email,
          String(p.total.submitted),
          String(p.total.reviewed),
          String(p.total.credited),
          `${p.total.applicationsMet} of ${p.total.applications}`,
          String(signalled(p)),
        ],
      })),
    );

    // Per application across the program, in the order the first sonographer lists them.
    const byCode = new Map<
      string,
      { name: string; submitted: number; reviewed: number; credited: number; met: number; people: number; unacceptable: number }
    >();
    for (const p of data.sonographers) {
      for (const a of p.applications) {
        const row = byCode.get(a.application.code) ?? { name: a.application.name, submitted: 0, reviewed: 0, credited: 0, met: 0, people: 0, unacceptable: 0 };
        row.submitted += a.submitted;
        row.reviewed += a.reviewed;
        row.credited += a.credited;
        row.met += a.met ? 1 : 0;
        row.people += 1;
        row.unacceptable += a.cusum.signal === "unacceptable" ? 1 : 0;
        byCode.set(a.application.code, row);
      }
    }
    pg.sectionTitle("Per application across the program");
    pg.table(
      [
        { header: "Application", width: 150 },
        { header: "Submitted", width: 60, align: "right" },
        { header: "Reviewed", width: 60, align: "right" },
        { header: "Credited", width: 60, align: "right" },
        { header: "Clinicians at threshold", width: 85, align: "right" },
        { header: "Unacceptable signalled", width: CONTENT_WIDTH - 150 - 60 * 3 - 85, align: "right" },
      ],
      [...byCode.values()].map((r) => ({
        cells: [r.name, String(r.submitted), String(r.reviewed), String(r.credited), `${r.met} of ${r.people}`, String(r.unacceptable)],
      })),
    );
  }
  pg.signatureBlock(`I have reviewed this summary of ${data.programName} (${formatRange(data.range)}); each clinician's record follows on its own pages.`);
}

/** The report as a PDF: a program summary first (scope "program"), then a section per sonographer, each on new pages. */
export function renderCredentialingPdf(data: CredentialingReportData): Promise<Buffer> {
  const fonts = loadFonts();
  const subject = data.scope === "sonographer" && data.sonographers[0] ? data.sonographers[0].sonographer.name : data.programName;
  const doc = new PDFDocument({
    size: PAGE.size,
    margins: { top: PAGE.top, bottom: PAGE.bottom, left: PAGE.left, right: PAGE.right },
    bufferPages: true,
    autoFirstPage: false,
    lang: "en",
    info: {
      Title: `Credentialing report: ${subject}`,
      Author: "Soundings",
      Subject: `${data.programName}, ${formatRange(data.range)}`,
      CreationDate: data.generatedAt,
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  try {
    const pg = new Pager(doc, fonts);
    if (data.scope === "program") {
      pg.newPage();
      programSummary(pg, data);
    }
    for (const p of data.sonographers) {
      pg.continuation = "";
      pg.newPage();
      sonographerSection(pg, data, p);
    }
    if (doc.bufferedPageRange().count === 0) {
      // A sonographer report without its sonographer: still a valid file that says so.
      pg.newPage();
      pg.titleBlock(data.programName, [
        ["Dates", formatRange(data.range)],
        ["Generated", formatGenerated(data.generatedAt)],
      ]);
      pg.paragraph("No clinician to report on.", { size: 9, color: COLOUR.muted });
    }
    pg.footers(CREDENTIALING_CAUTION);
    doc.end();
  } catch (err) {
    doc.end();
    return Promise.reject(err);
  }
  return done;
}
