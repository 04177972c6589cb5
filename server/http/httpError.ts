/**
 * The error type of the HTTP layer itself (415, 413, 401, 429, a route's own 400/404/409): a status,
 * a message people can read, and for invalid input every offending field with the reason. The
 * domain (register/, auth/) throws the errors of server/domainErrors.ts instead. `onError` in
 * app.ts turns both into JSON, once; anything else becomes a plain 500 with no stack trace or SQL
 * in the body.
 */
import { issuePaths, type IssueLike, type PathIssue } from '../engine/issueWords.ts';

/** A problem with one field: dotted path ("structure.masses.2.xM", or "" for the body itself) and the reason. */
export type FieldIssue = PathIssue;

export class HttpError extends Error {
  readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 429 | 500 | 503;
  readonly issues: FieldIssue[] | undefined;

  constructor(status: HttpError['status'], message: string, issues?: FieldIssue[]) {
    super(message);
    this.status = status;
    this.issues = issues;
  }

  static invalid(issues: FieldIssue[]): HttpError {
    return new HttpError(400, 'invalid input', issues);
  }

  static notFound(what: string): HttpError {
    return new HttpError(404, `${what} not found`);
  }
}

/**
 * Zod issues (or anything with path + message) as field issues with dotted paths. An unknown key
 * is reported at its own path ("is not a field..."), so a misspelt field is named, not its parent;
 * the library's own wording becomes a plain phrase (engine/issueWords.ts).
 */
export function fieldIssues(issues: ReadonlyArray<IssueLike & { path: ReadonlyArray<PropertyKey>; keys?: readonly string[] }>, prefix = ''): FieldIssue[] {
  return issuePaths(issues, { prefix });
}
