/**
 * The one error type of the HTTP layer: a status, a message people can read, and for invalid
 * input every offending field with the reason. `onError` in app.ts turns it into JSON; anything
 * else becomes a plain 500 with no stack trace or SQL in the body.
 */
import { plainIssueMessage, type IssueLike } from '../engine/issueWords.ts';

export interface FieldIssue {
  /** Dotted path of the field ("structure.masses.2.xM"), or "" for the body itself. */
  path: string;
  message: string;
}

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
  const dotted = (path: ReadonlyArray<PropertyKey>) => [prefix, ...path.map(String)].filter((p) => p !== '').join('.');
  return issues.flatMap((issue) =>
    issue.code === 'unrecognized_keys' && issue.keys
      ? issue.keys.map((key) => ({ path: dotted([...issue.path, key]), message: 'is not a field here (check the spelling)' }))
      : [{ path: dotted(issue.path), message: plainIssueMessage(issue) }],
  );
}
