// The download's file name comes from the server's Content-Disposition header. Checked
// against the examples of RFC 6266 (section 5) and the header Express's res.attachment()
// writes for the credentialing report.
import { describe, expect, it } from "vitest";
import { fileNameFrom } from "./roster";

describe("fileNameFrom", () => {
  it('reads a quoted file name (RFC 6266 §5: attachment; filename="example.html")', () => {
    expect(fileNameFrom('Attachment; filename="example.html"', "x")).toBe("example.html");
  });

  it("prefers filename* over filename (RFC 6266 §5, the EURO rates example)", () => {
    expect(fileNameFrom(`attachment; filename="EURO rates"; filename*=utf-8''%e2%82%ac%20rates`, "x")).toBe("\u20ac rates");
  });

  it("reads the header Express writes for the report (res.attachment)", () => {
    expect(fileNameFrom('attachment; filename="credentialing-lena-sorvik-all-dates.pdf"', "x")).toBe("credentialing-lena-sorvik-all-dates.pdf");
  });

  it("reads an unquoted token", () => {
    expect(fileNameFrom("attachment; filename=report.csv", "x")).toBe("report.csv");
  });

  it("keeps only a bare name when the header carries a path", () => {
    expect(fileNameFrom('attachment; filename="../../etc/passwd"', "x")).toBe(".._.._etc_passwd");
  });

  it("falls back when there is no header or no name", () => {
    expect(fileNameFrom(null, "credentialing-report.pdf")).toBe("credentialing-report.pdf");
    expect(fileNameFrom("attachment", "credentialing-report.csv")).toBe("credentialing-report.csv");
  });
});
