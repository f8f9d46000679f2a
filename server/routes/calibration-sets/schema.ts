// The schemas the calibration-sets routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export {
  calibrationResultsSchema,
  calibrationSetCreatedSchema,
  calibrationSetListSchema,
  createCalibrationSetSchema,
  referenceFormSchema,
} from "../../../shared/schemas/calibration";
export { idParamsSchema } from "../../../shared/schemas/common";
