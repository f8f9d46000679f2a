// The credentialing report for a program of 60 sonographers, timed beside a reference in
// the same run: bare pdfkit writing the same text (every line the report holds, as
// extracted by pdftotext) in the same embedded font, without tables or layout. The ratio is
// the cost of the report's layout over writing its words.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import PDFDocument from "pdfkit";
import { renderCredentialingCsv, renderCredentialingPdf, type CredentialingReportData } from "../server/reports/credentialing";
import { PROGRAM, zdenka } from "../server/reports/credentialing.fixture";
import { loadFonts } from "../server/reports/pdf-pager";

const people = Array.from({ length: 60 }, (_, i) => {
  const p = zdenka();
  return { ...p, sonographer: { ...p.sonographer, name: `Learner ${i + 1} Benchperson`, email: `learner${i + 1}@cedarhollow.example` } };
});
const data: CredentialingReportData = {
  programName: PROGRAM,
  generatedAt: new Date(),
  range: { from: null, to: null },
  scope: "program",
  sonographers: people,
};

const time = async (fn: () => Promise<unknown>, runs = 5) => {
  await fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t = process.hrtime.bigint();
    await fn();
    times.push(Number(process.hrtime.bigint() - t) / 1e6);
  }
  return times.sort((a, b) => a - b)[Math.floor(runs / 2)];
};

const pdf = await renderCredentialingPdf(data);
const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "soundings-bench-")), "report.pdf");
fs.writeFileSync(file, pdf);
const lines = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" })
  .split("\n")
  .filter((l) => l.trim());

const fonts = loadFonts();
const reference = () =>
  new Promise<Buffer>((resolve) => {
    const doc = new PDFDocument({ size: "A4", margin: 50 });
    const chunks: Buffer[] = [];
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.registerFont("body", fonts.files.latin.regular);
    doc.font("body").fontSize(9);
    for (const l of lines) doc.text(l.trim());
    doc.end();
  });

const report = await time(() => renderCredentialingPdf(data));
const bare = await time(reference);
const csv = await time(async () => renderCredentialingCsv(data));
console.log(`credentialing PDF, 60 sonographers (${pdf.length} bytes, ${lines.length} text lines): ${report.toFixed(0)} ms`);
console.log(`reference, bare pdfkit writing the same lines in the same font: ${bare.toFixed(0)} ms`);
console.log(`ratio report / reference: ${(report / bare).toFixed(2)} (target ≤ 3: layout costs at most twice the writing)`);
console.log(`CSV of the same data: ${csv.toFixed(1)} ms`);
