export { LogFormatError } from "./log-format-error";
export {
  guessColumnMapping,
  resolveColumnMapping,
  headerKey,
  type ColumnRole,
  type ColumnIndices,
  type ExplicitColumnMapping,
  type ColumnMappingResult,
} from "./column-mapping";
export { detectDelimiter, delimiterName, type Delimiter } from "./delimiter";
export { ReadingColumnsBuilder, type LogReadings, type ColumnPresence } from "./reading-columns";
export {
  createLogStreamParser,
  parseLogText,
  DEFAULT_FIELD_RANGE_NT,
  type LogParseOptions,
  type LogParseResult,
  type LogParseSummary,
  type LogStreamParser,
  type LogStreamSinks,
  type RejectReason,
  type IssueReason,
  type RowProblem,
} from "./log-parser";
