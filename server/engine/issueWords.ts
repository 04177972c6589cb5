/**
 * The validation library's own wording ("Invalid input: expected number, received undefined",
 * "Invalid discriminator value. Expected 'tent' | …", "Too small: expected string to have >=1
 * characters") as the plain phrases every message of this project is written in: a predicate that
 * follows the field's name ("heightM is required (a number)", "kind must be one of tent, banner,
 * screen, shell or custom, not “yurt”"). An issue path names the field; the phrase says what is
 * wrong and what would be accepted.
 *
 * Messages the schemas give themselves ("must be > 0 m") are kept as they are: only the library's
 * defaults, which all start with a capital ("Invalid …", "Too small …", "Too big …"), are
 * rewritten.
 */

/** The parts of a zod issue (v4) the wording needs; anything with a path and a message will do. */
export interface IssueLike {
  code?: string;
  message: string;
  expected?: unknown;
  input?: unknown;
  values?: readonly unknown[];
  options?: readonly unknown[];
  discriminator?: string;
  origin?: string;
  minimum?: unknown;
  maximum?: unknown;
  inclusive?: boolean;
  divisor?: unknown;
  format?: string;
}

const libraryDefault = /^(Invalid|Too (small|big)|Unrecognized)\b/;

/** “yurt”, 12, true: a value as a person reads it, cut short when long. */
function shown(value: unknown): string {
  if (typeof value === 'string') return `“${value.length > 40 ? `${value.slice(0, 40)}…` : value}”`;
  if (typeof value === 'number' || typeof value === 'boolean' || typeof value === 'bigint') return String(value);
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'object') return 'an object';
  return String(value);
}

/** "a", "a or b", "a, b or c". */
function oneOf(values: readonly unknown[]): string {
  const words = values.map((v) => (typeof v === 'string' ? v : shown(v)));
  if (words.length <= 1) return words.join('');
  return `${words.slice(0, -1).join(', ')} or ${words.at(-1)}`;
}

const typeWords: Readonly<Record<string, string>> = {
  number: 'a number',
  int: 'a whole number',
  string: 'text',
  boolean: 'true or false',
  array: 'a list',
  object: 'an object',
  date: 'a date',
  bigint: 'a whole number',
  null: 'null',
};

/** What a value is, in the words of typeWords: "text", "a list". */
function received(value: unknown, message: string): string | null {
  if (value === undefined) {
    const m = /received (\w+)/.exec(message);
    return m ? (m[1] === 'string' ? 'text' : m[1] === 'array' ? 'a list' : m[1] === 'object' ? 'an object' : m[1]!) : null;
  }
  if (value === null) return 'null';
  if (typeof value === 'string') return `text (${shown(value)})`;
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : 'not a finite number';
  if (typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return 'a list';
  return typeWords[typeof value] ?? typeof value;
}

function isMissing(issue: IssueLike): boolean {
  return issue.input === undefined && /received undefined/.test(issue.message);
}

/** A bound in words: "≥ 0", "> 0". */
function bound(issue: IssueLike, low: boolean): string {
  const value = issue.code === 'too_small' ? issue.minimum : issue.maximum;
  const strict = issue.inclusive === false;
  return `${low ? (strict ? '>' : '≥') : strict ? '<' : '≤'} ${String(value)}`;
}

/**
 * The plain phrase for one issue (see the module comment). `discriminator` issues name the
 * accepted values and, when the input was reported, the value that was given.
 *
 * @example plainIssueMessage({ code: 'invalid_type', expected: 'number', message: 'Invalid input: expected number, received undefined' })
 *   // → 'is required (a number)'
 */
export function plainIssueMessage(issue: IssueLike): string {
  const message = issue.message;
  if (!libraryDefault.test(message)) return message;
  switch (issue.code) {
    case 'invalid_type': {
      const expected = typeWords[String(issue.expected)] ?? String(issue.expected);
      if (isMissing(issue)) return `is required (${expected})`;
      if (issue.expected === 'int') return 'must be a whole number';
      const got = received(issue.input, message);
      return got ? `must be ${expected}, not ${got}` : `must be ${expected}`;
    }
    case 'invalid_union': {
      if (issue.discriminator !== undefined && issue.options) {
        const given = issue.input !== null && typeof issue.input === 'object' ? (issue.input as Record<string, unknown>)[issue.discriminator] : undefined;
        const accepted = `one of ${oneOf(issue.options)}`;
        if (issue.input !== undefined && given === undefined) return `is required: ${accepted}`;
        return given === undefined ? `must be ${accepted}` : `must be ${accepted}, not ${shown(given)}`;
      }
      return 'is not in any of the accepted forms';
    }
    case 'invalid_value': {
      const values = issue.values ?? [];
      const accepted = values.length === 1 ? shown(values[0]) : values.length === 2 ? `${shown(values[0])} or ${shown(values[1])}` : `one of ${values.map(shown).join(', ')}`;
      return issue.input === undefined ? `must be ${accepted}` : `must be ${accepted}, not ${shown(issue.input)}`;
    }
    case 'too_small':
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? 'must not be empty' : `must be at least ${String(issue.minimum)} characters`;
      if (issue.origin === 'array' || issue.origin === 'set') return `must list at least ${String(issue.minimum)}`;
      return `must be ${bound(issue, true)}`;
    case 'too_big':
      if (issue.origin === 'string') return `must be at most ${String(issue.maximum)} characters`;
      if (issue.origin === 'array' || issue.origin === 'set') return `must list at most ${String(issue.maximum)}`;
      return `must be ${bound(issue, false)}`;
    case 'invalid_format':
      if (issue.format === 'email') return 'must be an e-mail address';
      if (issue.format === 'url') return 'must be a web address';
      return 'is not in the accepted form';
    case 'not_multiple_of':
      return `must be a multiple of ${String(issue.divisor)}`;
    case 'invalid_key':
      return 'is not an accepted key';
    case 'invalid_element':
      return 'holds a value that is not accepted';
    case 'unrecognized_keys':
      return 'holds a field that is not known (check the spelling)';
    default:
      return 'is not accepted';
  }
}

/** A problem with one field: dotted path ("masses.2.xM", "" for the whole input) and the reason. */
export interface PathIssue {
  path: string;
  message: string;
}

/** What an unknown key is called: "is not a field here" (request bodies), "is not a known field" (structure records). */
export const unknownFieldMessages = {
  here: 'is not a field here (check the spelling)',
  known: 'is not a known field (check the spelling)',
} as const;

/**
 * The one mapper from zod issues (or anything with a path and a message) to field issues with
 * dotted paths under `prefix`. An unknown key is reported at its own path with `unknownField`, so
 * a misspelt field is named, not the object holding it; the library's own wording becomes a plain
 * phrase (`plainIssueMessage`).
 *
 * @example issuePaths(z.strictObject({ a: z.number() }).safeParse({ b: 1 }).error!.issues, { prefix: 'x' })
 * // → [{ path: 'x.a', message: 'is required (a number)' }, { path: 'x.b', message: 'is not a field here (check the spelling)' }]
 */
export function issuePaths(
  issues: ReadonlyArray<IssueLike & { path: ReadonlyArray<PropertyKey>; keys?: readonly string[] }>,
  options: { prefix?: string | undefined; unknownField?: string } = {},
): PathIssue[] {
  const prefix = options.prefix ?? '';
  const unknownField = options.unknownField ?? unknownFieldMessages.here;
  const dotted = (path: ReadonlyArray<PropertyKey>) => [prefix, ...path.map(String)].filter((p) => p !== '').join('.');
  return issues.flatMap((issue) =>
    issue.code === 'unrecognized_keys' && issue.keys
      ? issue.keys.map((key) => ({ path: dotted([...issue.path, key]), message: unknownField }))
      : [{ path: dotted(issue.path), message: plainIssueMessage(issue) }],
  );
}
