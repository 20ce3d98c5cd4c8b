/**
 * The import layer: read a CSV or XLSX file (from disk or from memory, within the limits of
 * lib/limits.ts), check every row against the lookups the caller supplies, and report every
 * problem by line and column. No database: writing the validated rows (all or nothing, in one
 * transaction) is the caller's job.
 */
export { ImportFileError, IMPORT_FILE_ERROR_CODES, type ImportFileErrorCode } from "./errors";
export {
  parseTabularFile,
  parseTabularPath,
  parseTabularStream,
  parseTabular,
  normalizeHeader,
  MAX_FILE_BYTES,
  MAX_DATA_ROWS,
  type ParsedTable,
  type ParsedRow,
  type TabularFormat,
  type TabularSource,
} from "./parse";
export { type ImportColumn, type ImportIssue, type ColumnType } from "./columns";
export {
  CONTAINER_COLUMNS,
  validateContainerRows,
  readAmountUnit,
  type ContainerKind,
  type ContainerLookups,
  type ContainerValidation,
  type ValidContainerRow,
} from "./containers";
export {
  LOCATION_COLUMNS,
  validateLocationRows,
  type LocationLookups,
  type LocationValidation,
  type ValidSite,
  type ValidRoom,
  type ValidUnit,
} from "./locations";
export { containerTemplateCsv, locationTemplateCsv, templateFileSchema, writeTemplateXlsx, type TemplateKind } from "./templates";
export { casCheckDigit, readCas, readDate, readNumber } from "./values";
