/**
 * Reading temperature-logger exports (CSV): layout detection, the column mapping, dates and times
 * in a chosen time zone, units, and one row to one reading with every problem by line and column.
 * Pure: no database, no files. lib/temperatures/csv-upload.ts streams a stored file through it.
 */
export { CsvRecordReader, CsvRecordError, CsvLimitError, isBlankRecord, type CsvRecord, type CsvRecordLimits } from "./records";
export { detectLayout, detectDelimiter, type DetectedLayout, type SuggestedMapping } from "./detect";
export { csvMappingSchema, toRememberedMapping, CSV_DELIMITERS, DELIMITER_LABELS, UNIT_CHOICES, type CsvMapping, type CsvMappingInput, type CsvDelimiter, type RememberedMapping, type UnitChoice } from "./mapping";
export { createRowReader, createMemoryInstantIndex, duplicateError, numberedHeaders, CsvMappingError, type CsvReading, type CsvRowError, type InstantIndex, type RowReader } from "./rows";
export { parseTimestamp, parseDateAndTime, guessDateOrder, DATE_ORDER_LABELS, type DateOrder } from "./timestamps";
export { readTemperature, readUnit, storedTempC, unitInHeader, UNIT_LABELS, type DecimalSeparator } from "./values";
export { detectEncoding, ENCODING_LABELS, type TextEncoding } from "./text";
export { ZonedClock, resolveLocalTime, zoneOffsetMs, isValidTimeZone, formatOffset, fixedOffsetZones, fixedOffsetZoneFor, type LocalResolution } from "./zoned-time";
