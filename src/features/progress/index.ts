// The progress feature's public entry: what other features (the QA lead's roster, the exam
// page) show of a sonographer's progress. Everything else in the feature is its own.
export { AccuracyTable } from "./components/accuracy-table";
export { ConfirmationsForm } from "./components/confirmations-form";
export { CriterionTrends } from "./components/criterion-trends";
export { LearningCurve } from "./components/learning-curve";
export { ProgressSummary } from "./components/progress-summary";
export { StrengthsAndFocus } from "./components/strengths-and-focus";
export { useReportDownload, type ReportDownloadState, type ReportFormat, type ReportRequest } from "./api/credentialing-report";
