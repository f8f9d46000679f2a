// Drawing primitives for the PDF reports: the shipped Noto Sans loaded once, text set run by
// run in the font subset that covers it, and a pager that places lines, tables, a title
// block and a signature block at fixed positions and breaks pages only where it decides.
//
// Nothing here uses pdfkit's line wrapper: every string is drawn with lineBreak off at a
// computed place, so a footer can sit in the bottom margin without starting a new page.
// Noto Sans (npm @fontsource/noto-sans) comes split into unicode subsets; a name such as
// "Dvořák" mixes latin and latin-ext, so each string is cut into runs per subset.
import fs from "node:fs";
import path from "node:path";
import { createRequire } from "node:module";
import { inflateSync } from "node:zlib";

// ---------------------------------------------------------------------------------------
// Fonts: read once per process, shared by every document

// Subsets tried in order for each character; latin covers the report's own wording.
const SUBSETS = ["latin", "latin-ext", "vietnamese", "greek", "cyrillic", "cyrillic-ext"] as const;
type Subset = (typeof SUBSETS)[number];
type Weight = "regular" | "bold";

/** The font files per subset and weight, and the code points each subset covers. */
export interface FontSet {
  files: Record<Subset, Record<Weight, Buffer>>;
  ranges: Record<Subset, [number, number][]>;
}

let fontSet: FontSet | null = null;

/**
 * Unwraps a WOFF 1.0 file (W3C WOFF File Format 1.0, sections 3–5) into the plain
 * TrueType/OpenType font it carries. fontkit can read WOFF itself, but inflates it with a
 * JavaScript zlib in every document (about 0.2 s per report); node's zlib does it once.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString("latin1", 0, 4) !== "wOFF") throw new Error("not a WOFF 1.0 font");
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const stored = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(stored) : stored;
    if (data.length !== origLength) throw new Error("WOFF table has the wrong length");
    return { tag: woff.subarray(at, at + 4), checksum: woff.readUInt32BE(at + 16), data };
  });
  // The sfnt header's binary-search fields (OpenType spec, "Table directory").
  const entrySelector = Math.floor(Math.log2(numTables));
  const searchRange = 2 ** entrySelector * 16;
  const pad = (n: number) => (n + 3) & ~3;
  let offset = 12 + numTables * 16;
  const out = Buffer.alloc(offset + tables.reduce((s, t) => s + pad(t.data.length), 0));
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  tables.forEach((t, i) => {
    const at = 12 + i * 16;
    t.tag.copy(out, at);
    out.writeUInt32BE(t.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(t.data.length, at + 12);
    t.data.copy(out, offset);
    offset += pad(t.data.length);
  });
  return out;
}

/** The report fonts (regular and bold per subset), read and unwrapped on first use and then kept. */
export function loadFonts(): FontSet {
  if (fontSet) return fontSet;
  // The package exports only its CSS files; resolving one finds the folder.
  const dir = path.dirname(createRequire(import.meta.url).resolve("@fontsource/noto-sans/latin-400.css"));
  const unicode = JSON.parse(fs.readFileSync(path.join(dir, "unicode.json"), "utf8")) as Record<string, string>;
  // The WOFF files, not WOFF2: pdfkit 0.20.2's fontkit fails on these WOFF2 files ("Offset is
  // outside the bounds of the DataView").
  const read = (subset: Subset, weight: number) => woffToSfnt(fs.readFileSync(path.join(dir, "files", `noto-sans-${subset}-${weight}-normal.woff`)));
  const files = {} as FontSet["files"];
  const ranges = {} as FontSet["ranges"];
  for (const s of SUBSETS) {
    files[s] = { regular: read(s, 400), bold: read(s, 700) };
    ranges[s] = (unicode[s] ?? "").split(",").map((r) => {
      const [a, b] = r.replace(/U\+/g, "").split("-");
      return [parseInt(a, 16), parseInt(b ?? a, 16)];
    });
  }
  fontSet = { files, ranges };
  return fontSet;
}

function subsetFor(fonts: FontSet, cp: number): Subset {
  for (const s of SUBSETS) if (fonts.ranges[s].some(([a, b]) => cp >= a && cp <= b)) return s;
  return "latin";
}

/** Cuts a string into runs each set in one subset. */
function runsOf(fonts: FontSet, text: string): { subset: Subset; text: string }[] {
  // Most strings are plain latin (part of the latin subset's own range): one run.
  if (!/[^\u0020-\u00ff\u2000-\u206f\u2212]/.test(text)) return [{ subset: "latin", text }];
  const runs: { subset: Subset; text: string }[] = [];
  for (const ch of text) {
    const subset = subsetFor(fonts, ch.codePointAt(0)!);
    const last = runs[runs.length - 1];
    if (last && last.subset === subset) last.text += ch;
    else runs.push({ subset, text: ch });
  }
  return runs;
}

// ---------------------------------------------------------------------------------------
// PDF drawing

/** Quiet colours from the app's theme (tailwind.config.ts): ink-navy text, sea teal accent. */
export const COLOUR = { ink: "#122230", muted: "#43627f", accent: "#0f6e70", rule: "#b5c6d5", faint: "#d9e3ec", headFill: "#eef7f6" };
/** A4 portrait with its margins, in points; the bottom margin holds the footer. */
export const PAGE = { size: "A4" as const, width: 595.28, height: 841.89, left: 50, right: 50, top: 48, bottom: 70 };
export const CONTENT_WIDTH = PAGE.width - PAGE.left - PAGE.right;
const BODY_BOTTOM = PAGE.height - PAGE.bottom;

interface TextStyle {
  size?: number;
  weight?: Weight;
  color?: string;
}

type Align = "left" | "right" | "center";

/** A table column: header text, width in points, alignment of its cells. */
export interface Column {
  header: string;
  width: number;
  align?: Align;
}

/** A table row: one string per column. */
export interface Row {
  cells: string[];
  /** A muted line under the row spanning the table (counts behind the rates). */
  note?: string;
  bold?: boolean;
}

/** Places text, tables and blocks on the pages of one document, top to bottom. */
export class Pager {
  y = PAGE.top;
  /** Drawn at the top of a page the content runs on to. */
  continuation = "";

  constructor(
    readonly doc: PDFKit.PDFDocument,
    readonly fonts: FontSet,
  ) {
    for (const s of SUBSETS) {
      doc.registerFont(`${s}-regular`, fonts.files[s].regular);
      doc.registerFont(`${s}-bold`, fonts.files[s].bold);
    }
  }

  private use(subset: Subset, style: TextStyle) {
    this.doc
      .font(`${subset}-${style.weight ?? "regular"}`)
      .fontSize(style.size ?? 9)
      .fillColor(style.color ?? COLOUR.ink);
  }

  width(text: string, style: TextStyle = {}): number {
    let w = 0;
    for (const run of runsOf(this.fonts, text)) {
      this.use(run.subset, style);
      w += this.doc.widthOfString(run.text);
    }
    return w;
  }

  /**
   * One line of text at (x, y) — the top of the line — made to fit `width`: `shrink` first
   * lowers the size (to 6.5 pt at least, so a number stays whole), then an ellipsis cuts it.
   */
  text(text: string, x: number, y: number, style: TextStyle = {}, width?: number, align: Align = "left", shrink = false) {
    let t = text;
    let w = this.width(t, style);
    if (shrink && width !== undefined && w > width) {
      const size = Math.max(6.5, ((style.size ?? 9) * width) / w);
      style = { ...style, size };
      w = this.width(t, style);
    }
    if (width !== undefined && w > width) {
      const chars = Array.from(text);
      while (chars.length > 0 && w > width) {
        chars.pop();
        t = chars.join("").trimEnd() + "…";
        w = this.width(t, style);
      }
    }
    let cx = x;
    if (width !== undefined && align === "right") cx = x + width - w;
    if (width !== undefined && align === "center") cx = x + (width - w) / 2;
    for (const run of runsOf(this.fonts, t)) {
      this.use(run.subset, style);
      // No `features: ["tnum"]`: Noto Sans's default figures are already tabular (every digit
      // 572 units wide), and passing features turns off pdfkit's per-word layout cache.
      this.doc.text(run.text, cx, y, { lineBreak: false });
      cx += this.doc.widthOfString(run.text);
    }
  }

  /** Greedy word wrap to `width`. */
  wrap(text: string, width: number, style: TextStyle = {}): string[] {
    const lines: string[] = [];
    let line = "";
    for (const word of text.split(/\s+/).filter(Boolean)) {
      const candidate = line ? `${line} ${word}` : word;
      if (line && this.width(candidate, style) > width) {
        lines.push(line);
        line = word;
      } else line = candidate;
    }
    if (line) lines.push(line);
    return lines;
  }

  lineHeight(style: TextStyle = {}): number {
    return (style.size ?? 9) * 1.4;
  }

  /** A wrapped paragraph at the current position. */
  paragraph(text: string, style: TextStyle = {}, gapAfter = 4) {
    const lines = this.wrap(text, CONTENT_WIDTH, style);
    for (const line of lines) {
      this.ensure(this.lineHeight(style));
      this.text(line, PAGE.left, this.y, style);
      this.y += this.lineHeight(style);
    }
    this.y += gapAfter;
  }

  rule(y: number, color = COLOUR.faint, width = 0.5, x0 = PAGE.left, x1 = PAGE.width - PAGE.right) {
    this.doc.save().moveTo(x0, y).lineTo(x1, y).lineWidth(width).strokeColor(color).stroke().restore();
  }

  newPage() {
    this.doc.addPage({ size: PAGE.size, margins: { top: PAGE.top, bottom: PAGE.bottom, left: PAGE.left, right: PAGE.right } });
    this.y = PAGE.top;
    if (this.continuation) {
      this.text(this.continuation, PAGE.left, this.y, { size: 8, color: COLOUR.muted }, CONTENT_WIDTH);
      this.y += 14;
      this.rule(this.y - 3);
      this.y += 6;
    }
  }

  /** Starts a new page unless `height` still fits on this one; true when it broke. */
  ensure(height: number): boolean {
    if (this.y + height <= BODY_BOTTOM) return false;
    this.newPage();
    return true;
  }

  sectionTitle(title: string, keepWith = 40) {
    this.ensure(24 + keepWith);
    this.y += 8;
    this.text(title, PAGE.left, this.y, { size: 10.5, weight: "bold", color: COLOUR.accent });
    this.y += 17;
  }

  private tableHeader(columns: Column[]) {
    const style: TextStyle = { size: 7.5, weight: "bold", color: COLOUR.muted };
    const lines = columns.map((c) => this.wrap(c.header, c.width - 6, style));
    const height = Math.max(...lines.map((l) => l.length)) * 10 + 7;
    this.doc.save().rect(PAGE.left, this.y, CONTENT_WIDTH, height).fill(COLOUR.headFill).restore();
    let x = PAGE.left;
    columns.forEach((c, i) => {
      // Headers sit on the bottom line like the numbers below them.
      const top = this.y + height - 4 - lines[i].length * 10;
      lines[i].forEach((line, j) => this.text(line, x + 3, top + j * 10, style, c.width - 6, c.align ?? "left"));
      x += c.width;
    });
    this.y += height;
    this.rule(this.y, COLOUR.rule, 0.75);
  }

  /** A table whose header row repeats on every page it runs onto. */
  table(columns: Column[], rows: Row[]) {
    const rowHeight = 15;
    const noteHeight = 11;
    this.ensure(40 + rowHeight);
    this.tableHeader(columns);
    for (const row of rows) {
      const h = rowHeight + (row.note ? noteHeight : 0);
      if (this.ensure(h)) this.tableHeader(columns);
      let x = PAGE.left;
      row.cells.forEach((cell, i) => {
        const c = columns[i];
        this.text(cell, x + 3, this.y + 4, { size: 8, weight: row.bold ? "bold" : "regular" }, c.width - 6, c.align ?? "left", i > 0);
        x += c.width;
      });
      if (row.note) this.text(row.note, PAGE.left + 12, this.y + rowHeight - 1, { size: 7, color: COLOUR.muted }, CONTENT_WIDTH - 15);
      this.y += h;
      this.rule(this.y);
    }
    this.y += 4;
  }

  /** The document title block at the top of a page. */
  titleBlock(subtitle: string, meta: [string, string][]) {
    this.text("Credentialing report", PAGE.left, this.y, { size: 18, weight: "bold" });
    this.text(subtitle, PAGE.left, this.y + 6, { size: 9, color: COLOUR.muted }, CONTENT_WIDTH, "right");
    this.y += 27;
    this.rule(this.y, COLOUR.accent, 1.5);
    this.y += 9;
    for (const [label, value] of meta) {
      this.text(label, PAGE.left, this.y, { size: 8.5, color: COLOUR.muted }, 95);
      this.text(value, PAGE.left + 100, this.y, { size: 9 }, CONTENT_WIDTH - 100);
      this.y += 13;
    }
    this.y += 4;
  }

  /** Name, signature and date lines for the program director. */
  signatureBlock(statement: string) {
    this.ensure(96);
    this.y += 10;
    this.text("Program director review", PAGE.left, this.y, { size: 10.5, weight: "bold", color: COLOUR.accent });
    this.y += 17;
    this.paragraph(statement, { size: 8.5, color: COLOUR.muted }, 0);
    this.y += 28;
    const fields: [string, number][] = [
      ["Program director name", 190],
      ["Program director signature", 190],
      ["Date", 95],
    ];
    let x = PAGE.left;
    for (const [label, w] of fields) {
      this.rule(this.y, COLOUR.ink, 0.75, x, x + w);
      this.text(label, x, this.y + 4, { size: 8, color: COLOUR.muted }, w);
      x += w + 10;
    }
    this.y += 22;
  }

  /** The caution and the page number on every page; run once all pages exist. */
  footers(caution: string) {
    const range = this.doc.bufferedPageRange();
    const style: TextStyle = { size: 7, color: COLOUR.muted };
    const cautionLines = this.wrap(caution, CONTENT_WIDTH - 80, style);
    for (let i = range.start; i < range.start + range.count; i++) {
      this.doc.switchToPage(i);
      const top = PAGE.height - PAGE.bottom + 18;
      this.rule(top - 6, COLOUR.rule);
      cautionLines.forEach((line, j) => this.text(line, PAGE.left, top + j * 9.5, style));
      // On the caution's last line, so text extraction keeps the caution in one piece.
      const last = top + (cautionLines.length - 1) * 9.5;
      this.text(`Page ${i + 1 - range.start} of ${range.count}`, PAGE.width - PAGE.right - 75, last, style, 75, "right");
    }
  }
}
