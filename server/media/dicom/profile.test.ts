// The Basic Profile table against DICOM PS3.15 Table E.1-1 (Application Level Confidentiality
// Profile Attributes), rows checked by hand against the published table: the action of a few
// well-known attributes, how a choice of actions is settled, and the rules for private
// attributes, curves and overlays.
import { describe, expect, it } from "vitest";
import { actionFor, BASIC_PROFILE } from "./profile";

describe("Basic Application Level Confidentiality Profile", () => {
  it("gives the published actions", () => {
    // PS3.15 Table E.1-1: Patient's Name Z, Patient ID Z, Patient's Birth Date Z, Accession Number Z,
    // SOP Instance UID U, Study Instance UID U, Patient's Address X, Other Patient IDs X, Person Name D.
    expect(["00100010", "00100020", "00100030", "00080050"].map(actionFor)).toEqual(["Z", "Z", "Z", "Z"]);
    expect(["00080018", "0020000D", "0020000E", "00200052"].map(actionFor)).toEqual(["U", "U", "U", "U"]);
    expect(["00101040", "00101000", "0040A123"].map(actionFor)).toEqual(["X", "X", "D"]);
  });
  it("takes the action that keeps least where the table allows several", () => {
    // Operators' Name and Institution Name are X/Z/D; Content Date is Z/D; Referenced Image Sequence X/Z/U*.
    expect(["00081070", "00080080", "00080023", "00081140"].map(actionFor)).toEqual(["X", "X", "Z", "X"]);
  });
  it("removes private attributes, curves and overlay data, and keeps what the table does not list", () => {
    expect(["00091001", "00290010", "50000010", "60003000"].map(actionFor)).toEqual(["X", "X", "X", "X"]);
    // Sequence of Ultrasound Regions, Frame Time, Rows, SOP Class UID, Manufacturer: not listed, kept.
    expect(["00186011", "00181063", "00280010", "00080016", "00080070"].map(actionFor)).toEqual(["K", "K", "K", "K", "K"]);
    expect(BASIC_PROFILE.size).toBeGreaterThan(400);
  });
});
