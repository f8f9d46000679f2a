// The DICOM inbox routes' schemas, from shared/schemas/.
export { idParamsSchema } from "../../../shared/schemas/common";
export { examCreateSchema, examResponseSchema } from "../../../shared/schemas/exams";
export { inboxListSchema, inboxPreviewParamsSchema, inboxStudyResponseSchema } from "../../../shared/schemas/dicom-inbox";
