// The tidy-CSV intake shared by the API upload and the `fit` command: text in, results out, no I/O.
export { parseCsvText, utf8ByteLength, DEFAULT_MAX_BYTES, DEFAULT_MAX_COLUMNS } from "./csv-text";
export type { CsvTextOptions, CsvTextResult, ParsedCsv } from "./csv-text";
export { guessColumnMapping, validateMapping } from "./column-mapping";
export type { ColumnMappingGuess, MappingNote, MappingResult } from "./column-mapping";
export { analyseTidyRows, validateTidyRows } from "./tidy-rows";
export type { TidyAnalysis, TidyCell, TidyRow, TidyValidationOptions } from "./tidy-rows";
export { toPortfolioData, portfolioDataFromAnalysis } from "./portfolio-data";
export type { PortfolioDataResult } from "./portfolio-data";
export { readTidyCsv } from "./tidy-csv";
export type { TidyCsvOptions, TidyCsvResult } from "./tidy-csv";
export { parseLiftTestsCsv, validateLiftTest, LIFT_TEST_COLUMNS } from "./lift-tests";
export type { LiftTest, LiftTestResult, LiftTestsCsvResult } from "./lift-tests";
export { readNumber, MAX_MAGNITUDE } from "./numeric-value";
export type { NumberReading } from "./numeric-value";
export { displayName, nameKey, MAX_NAME_LENGTH } from "./entity-names";
export { DEFAULT_MAX_ISSUES, DEFAULT_MAX_ISSUES_PER_KIND, reportOf } from "./issue-list";
export type { IssueLimits } from "./issue-list";
