/**
 * Text formats read at the edges, each by one reader: ISO 8601 dates and instants, and delimited
 * text (CSV, semicolon- and tab-separated). Pure: no Node, no clock.
 */
export { isoDate, isoInstantMs, type IsoDate, type IsoProblem, type IsoRead } from './isoDateTime.ts';
export { delimitedProblemWords, readDelimited, type DelimitedProblem, type DelimitedRead, type DelimitedRecord } from './delimitedText.ts';
