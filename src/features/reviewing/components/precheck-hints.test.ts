// The pre-check's words for a calibrated (DICOM) depth: compared with the application's usual
// range when the server stored one, said plainly otherwise. Values are the project's own.
import { describe, expect, it } from "vitest";
import { hints } from "./precheck-hints";

describe("pre-check hints", () => {
  it("say a DICOM clip's depth against the application's usual range", () => {
    const deeper = hints({ depth: { hint: "fits", unusedShare: 0.1, cm: 24, typicalCm: [12, 20], against: "deeper_than_typical" } }, "curvilinear");
    expect(deeper).toContain("Imaging depth 24 cm, from the DICOM calibration: deeper than usual for this application (12–20 cm).");
    const within = hints({ depth: { cm: 16, typicalCm: [12, 20], against: "within_typical" } }, "curvilinear");
    expect(within).toEqual(["Imaging depth 16 cm, from the DICOM calibration: within the usual range for this application (12–20 cm)."]);
    expect(hints({ depth: { cm: 8 } }, "linear")).toEqual(["Imaging depth 8 cm, from the DICOM calibration."]);
    expect(hints({ depth: { hint: "fits", unusedShare: 0.05 } }, "linear").join(" ")).not.toMatch(/calibration/);
  });
});
