/**
 * CSV checks for the tests: a strict reader of RFC 4180 (no npm CSV parser is installed, and the
 * server's own parser in server/register/csv.ts must not be the judge of its own writer).
 */

/**
 * A strict reading of RFC 4180 section 2, written from the RFC's grammar: records
 * end in CRLF (a bare CR or LF outside quotes is an error), a field is either free of quotes,
 * commas and line breaks, or enclosed in double quotes with a quote inside written twice.
 */
export function parseRfc4180(text: string): string[][] {
  const records: string[][] = [];
  let record: string[] = [];
  let i = 0;
  const fail = (why: string): never => {
    throw new Error(`not RFC 4180 at character ${i}: ${why}`);
  };
  while (i < text.length) {
    let value = '';
    if (text[i] === '"') {
      i++;
      for (;;) {
        if (i >= text.length) fail('a quoted field is not closed');
        if (text[i] === '"') {
          if (text[i + 1] === '"') {
            value += '"';
            i += 2;
            continue;
          }
          i++;
          break;
        }
        value += text[i++];
      }
    } else {
      while (i < text.length && text[i] !== ',' && text[i] !== '\r') {
        if (text[i] === '"' || text[i] === '\n') fail(`${JSON.stringify(text[i])} in an unquoted field`);
        value += text[i++];
      }
    }
    record.push(value);
    if (text[i] === ',') {
      i++;
      continue;
    }
    if (text[i] === '\r' && text[i + 1] === '\n') {
      i += 2;
      records.push(record);
      record = [];
      continue;
    }
    fail('a field must be followed by a comma or CRLF');
  }
  if (record.length > 0) fail('the last record does not end in CRLF');
  return records;
}

