/**
 * The errors of the domain (the register, people and access, alerts, configurations): what went
 * wrong in the terms of the thing asked for, never an HTTP status. register/ and auth/ throw
 * these; the HTTP layer maps each class to its status once, in the hono app's onError
 * (http/app.ts `domainErrorResponse`):
 *
 * | class    | status | body                                   |
 * | -------- | ------ | -------------------------------------- |
 * | Invalid  | 400    | `{error: 'invalid input', issues: [{path, message}]}` |
 * | Refused  | 403    | `{error}`                              |
 * | NotFound | 404    | `{error: '<what> not found'}`          |
 * | Conflict | 409    | `{error}`                              |
 */
import type { PathIssue } from './engine/issueWords.ts';

/** Any domain error: its message is for people, and names no SQL or stack. */
export abstract class DomainError extends Error {
  override get name(): string {
    return this.constructor.name;
  }
}

/** The input is wrong: every offending field (dotted path, "" for the whole input) with the reason. */
export class Invalid extends DomainError {
  constructor(
    readonly issues: PathIssue[],
    message = 'invalid input',
  ) {
    super(message);
  }
}

/** The thing named does not exist, or is retired: the message is "<what> not found". */
export class NotFound extends DomainError {
  constructor(readonly what: string) {
    super(`${what} not found`);
  }
}

/** The change clashes with what is stored: a name or key taken, a state that forbids it. */
export class Conflict extends DomainError {}

/** Not allowed whoever asks (a wrong setup code): the request is understood and refused. */
export class Refused extends DomainError {}
