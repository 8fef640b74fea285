export { VerifyError, VERIFY_ERROR_CODES, type VerifyErrorCode } from './errors';
export { KEY_DIMENSION, KEY_LABEL, VERIFY_KEYS, keyFactor, keyUnit, type VerifyKey } from './keys';
export { MATERIALS, materialSchema, materialTable, parseMaterials, type Material, type MaterialInput } from './materials';
export { massPerMetre } from './mass';
export { DEFAULT_TOLERANCES, POSITION_KEYS, allowance, defaultTolerance, formatTolerance, parseTolerance, type Tolerance } from './tolerance';
export { csvText, parseCsv, type CsvRecord } from './csv';
export { manifestSchema, parseManifest, type Manifest, type ManifestOptions, type ManifestRow } from './manifest';
export { sha256 } from './hash';
export { outlineOf, type Outline } from './outline';
export { SectionFault, computeSection, type ComputeSection, type Section, type SectionOptions } from './compute';
export { checkRow, toleranceFor, type Check } from './check';
export { newRunId, runPassed, summarise, type Fault, type ProfileResult, type ProfileStatus, type RunRecord, type RunSummary } from './run';
export { cataloguePath } from './paths';
export { runVerification, type Catalogue, type CatalogueDrawing, type VerifyOptions } from './verify';
export { diffIsEmpty, diffRuns, type FailureItem, type Movement, type RunDiff, type RunRef } from './diff';
export { REPORT_CAUTION } from './caution';
export { renderHtmlReport } from './report-html';
export { sectionSvg } from './section-svg';
export { verificationCsv } from './export-csv';
export { verificationJson, type ExportValue } from './export-json';
export { significant, significantText, percent } from './format';
export { MAX_TIMER_MS, sleep, systemClock, type Clock } from './clock';
export { Scheduler, parseCron, type ScheduleEntry, type ScheduleEvent, type SchedulerOptions } from './schedule';
export {
  DELIVERY_HEADER,
  EVENT_HEADER,
  SIGNATURE_HEADER,
  TIMESTAMP_HEADER,
  checkWebhookUrl,
  defaultBackoff,
  deliverWebhook,
  verifyWebhookSignature,
  webhookSignature,
  type DeliveryAttempt,
  type DeliveryOptions,
  type WebhookRequest,
  type WebhookTarget,
  type WebhookTransport,
} from './webhook';
export { RUN_COMPLETED, runCompletedPayload } from './payload';
