/**
 * Splitting one line of a delimited table (CSV, semicolon or tab separated) into fields, with
 * RFC 4180 quoting: a field in double quotes may contain the separator, and "" inside it is one
 * quote. Fields never span lines here: forecast tables have no multi-line cells.
 */

/**
 * The fields of `line` split at `separator`, unquoted, or null when a quoted field is not closed.
 *
 * @example delimitedFields('2026-06-12 14:00;"12,5";18', ';') // → ['2026-06-12 14:00', '12,5', '18']
 */
export function delimitedFields(line: string, separator: string): string[] | null {
  const fields: string[] = [];
  let field = '';
  let quoted = false;
  let index = 0;
  while (index < line.length) {
    const char = line[index]!;
    if (quoted) {
      if (char === '"') {
        if (line[index + 1] === '"') {
          field += '"';
          index += 2;
          continue;
        }
        quoted = false;
      } else {
        field += char;
      }
    } else if (char === '"' && field.trim().length === 0) {
      quoted = true;
      field = '';
    } else if (char === separator) {
      fields.push(field);
      field = '';
    } else {
      field += char;
    }
    index++;
  }
  if (quoted) return null;
  fields.push(field);
  return fields;
}
