// The download's file name comes from the server's Content-Disposition header (checked
// against the examples of RFC 6266 (section 5) and the header Express's res.attachment()
// writes for the credentialing report), and a refused download becomes the server's ApiError.
import { afterEach, describe, expect, it, vi } from "vitest";
import { ApiError } from "./api-errors";
import { downloadFile, fileNameFrom } from "./download";

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

describe("downloadFile", () => {
  afterEach(() => vi.unstubAllGlobals());
  const options = { accept: "application/pdf", fallbackName: "report.pdf", refusedMessage: (status: number) => `refused ${status}` };

  it("asks for the file with the session and turns a refusal's error body into an ApiError", async () => {
    const fetch = vi.fn(async () => Response.json({ error: { code: "forbidden", message: "Only a QA lead may export the program." } }, { status: 403 }));
    vi.stubGlobal("fetch", fetch);
    const failure = await downloadFile("/reports/credentialing?format=pdf", options).catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(ApiError);
    expect(failure).toMatchObject({ status: 403, code: "forbidden", message: "Only a QA lead may export the program." });
    expect(fetch).toHaveBeenCalledWith(
      "/api/reports/credentialing?format=pdf",
      expect.objectContaining({ credentials: "include", headers: { Accept: "application/pdf" } }),
    );
  });

  it("says the caller's own words when a refusal has no JSON body", async () => {
    vi.stubGlobal(
      "fetch",
      vi.fn(async () => new Response("Bad Gateway", { status: 502 })),
    );
    await expect(downloadFile("/x", options)).rejects.toMatchObject({ status: 502, code: "http_502", message: "refused 502" });
  });

  it("reports a request that never reached the server as a network error, and passes an abort on", async () => {
    vi.stubGlobal(
      "fetch",
      vi.fn(async () => Promise.reject(new TypeError("Failed to fetch"))),
    );
    await expect(downloadFile("/x", options)).rejects.toMatchObject({ status: 0, code: "network_error" });
    vi.stubGlobal(
      "fetch",
      vi.fn(async () => Promise.reject(new DOMException("The operation was aborted.", "AbortError"))),
    );
    await expect(downloadFile("/x", options)).rejects.toMatchObject({ name: "AbortError" });
  });
});
