// The exams feature's public entry: what another feature (received DICOM studies) uses to
// describe an exam the same way Submit does. Everything else in the feature is its own.
export { ExamDetailsFields } from "./components/exam-details-fields";
export type { ExamFieldsBody } from "./api/exams";
