/**
 * Forecast tables as people paste them: comma, semicolon and tab separated, units in the header
 * or chosen, local or offset times. Unit factors are the exact definitions (1 km/h = 1/3.6 m/s;
 * 1 kn = 1852/3600 m/s, BIPM SI brochure table 8; 1 mph = 0.44704 m/s, 1959 yard and pound
 * agreement). Clock changes in Europe/London follow EU Directive 2000/84/EC and the UK Summer Time
 * Order 2002: summer time from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last
 * Sunday of October (29 March and 25 October in 2026). The tables are invented.
 */
import { describe, expect, it } from 'vitest';
import { maxForecastRows, parseForecastTable, type ForecastTable } from '../../../server/levels/index.ts';

function rowsOf(table: ForecastTable) {
  if (!table.ok) throw new Error(`expected rows, got problems: ${table.problems.map((p) => p.message).join(' | ')}`);
  return table.rows;
}
function problemsOf(table: ForecastTable) {
  if (table.ok) throw new Error('expected problems, got rows');
  return table.problems;
}

describe('parseForecastTable reads', () => {
  it('a comma-separated table with ISO 8601 UTC times and a chosen unit', () => {
    const text = 'time,mean,gust,direction\n2026-06-13T12:00Z,8.5,14.2,250\n2026-06-13T13:00:00Z,9,15.5,260\n';
    expect(rowsOf(parseForecastTable(text, { unit: 'm/s' }))).toEqual([
      { line: 2, timeMs: Date.UTC(2026, 5, 13, 12), meanMps: 8.5, gustMps: 14.2, dirFromDeg: 250 },
      { line: 3, timeMs: Date.UTC(2026, 5, 13, 13), meanMps: 9, gustMps: 15.5, dirFromDeg: 260 },
    ]);
  });

  it('a semicolon table in another column order with decimal commas, km/h in the header and compass points', () => {
    // 54 km/h = 15 m/s and 36 km/h = 10 m/s exactly (1 km/h = 1/3.6 m/s).
    const text = 'Gust (km/h);Wind direction;Time;Mean wind (km/h)\r\n54;WSW;2026-06-13 14:00;36\r\n61,2;nnw;2026-06-13 15:00;40,5\r\n';
    const rows = rowsOf(parseForecastTable(text, { timeZone: 'Europe/London' }));
    // 14:00 British Summer Time is 13:00 UTC.
    expect(rows[0]).toEqual({ line: 2, timeMs: Date.UTC(2026, 5, 13, 13), meanMps: 10, gustMps: 15, dirFromDeg: 247.5 });
    expect(rows[1]!.gustMps).toBeCloseTo(17, 12);
    expect(rows[1]!.meanMps).toBeCloseTo(11.25, 12);
    expect(rows[1]!.dirFromDeg).toBe(337.5);
  });

  it('a tab-separated table with units as the last word of the header and the zone on the time column', () => {
    const text = 'time (Europe/Berlin)\tgust_kn\tmean_kn\twind_dir\n2026-01-10 09:00\t20\t10\t360\n';
    const [row] = rowsOf(parseForecastTable(text));
    // 09:00 Central European Time (winter, UTC+1) is 08:00 UTC; 20 kn = 20 × 1852/3600 m/s.
    expect(row!.timeMs).toBe(Date.UTC(2026, 0, 10, 8));
    expect(row!.gustMps).toBeCloseTo(10.2889, 4);
    expect(row!.meanMps).toBeCloseTo(5.1444, 4);
    expect(row!.dirFromDeg).toBe(0); // 360° is north
  });

  it('mph, offsets other than Z and a header naming UTC', () => {
    const text = 'valid_time_utc,peak gust mph\n2026-06-13 18:00,30\n';
    expect(rowsOf(parseForecastTable(text))[0]).toMatchObject({ timeMs: Date.UTC(2026, 5, 13, 18), gustMps: 30 * 0.44704 });
    const offsets = 'time,gust\n2026-06-13T14:00+02:00,10\n2026-06-13T14:00:30.5-0130,10\n2026-06-13T14:00+05,10\n';
    expect(rowsOf(parseForecastTable(offsets, { unit: 'm/s' })).map((r) => r.timeMs)).toEqual([
      Date.UTC(2026, 5, 13, 12),
      Date.UTC(2026, 5, 13, 15, 30, 30, 500),
      Date.UTC(2026, 5, 13, 9),
    ]);
  });

  it('quoted fields holding the separator, and lists columns it does not use', () => {
    const text = 'time,"gust, m/s",rain (mm),notes\n2026-06-13T12:00Z,"12.5",0.2,"dry, bright"\n';
    const table = parseForecastTable(text);
    expect(rowsOf(table)[0]!.gustMps).toBe(12.5);
    expect(table.ok && table.ignoredColumns).toEqual(['rain (mm)', 'notes']);
  });

  it('empty cells and common "missing" marks as null, never 0', () => {
    const text = 'time;mean;gust;dir\n2026-06-13 12:00;;-;VRB\n2026-06-13 13:00;N/A;;\n';
    expect(rowsOf(parseForecastTable(text, { unit: 'm/s', timeZone: 'UTC' }))).toEqual([
      { line: 2, timeMs: Date.UTC(2026, 5, 13, 12), meanMps: null, gustMps: null, dirFromDeg: null },
      { line: 3, timeMs: Date.UTC(2026, 5, 13, 13), meanMps: null, gustMps: null, dirFromDeg: null },
    ]);
  });

  it('a header that starts with a digit, such as "10 min mean"', () => {
    const text = '10 min mean (m/s),time\n6.5,2026-06-13T12:00Z\n';
    expect(rowsOf(parseForecastTable(text))[0]).toMatchObject({ meanMps: 6.5, gustMps: null });
  });

  it('a table with only a mean column, skipping blank lines and counting them in line numbers', () => {
    const text = '\ntime,wind speed (m/s)\n\n2026-06-13T12:00Z,7\n';
    expect(rowsOf(parseForecastTable(text))).toEqual([
      { line: 4, timeMs: Date.UTC(2026, 5, 13, 12), meanMps: 7, gustMps: null, dirFromDeg: null },
    ]);
  });
});

describe('parseForecastTable across clock changes (Directive 2000/84/EC)', () => {
  it('refuses a local time the spring change skips (01:30 on 29 March 2026 in London)', () => {
    const [problem] = problemsOf(parseForecastTable('time,gust\n2026-03-29 01:30,10\n', { unit: 'm/s', timeZone: 'Europe/London' }));
    expect(problem).toMatchObject({ line: 2, column: 'time', value: '2026-03-29 01:30' });
    expect(problem!.reason).toMatch(/does not exist in Europe\/London/);
  });

  it('reads a repeated autumn hour as summer time first and winter time when the table has moved past it', () => {
    const text = 'time,gust\n2026-10-25 00:30,10\n2026-10-25 01:30,10\n2026-10-25 01:30,10\n2026-10-25 02:30,10\n';
    const times = rowsOf(parseForecastTable(text, { unit: 'm/s', timeZone: 'Europe/London' })).map((r) => r.timeMs);
    expect(times).toEqual([
      Date.UTC(2026, 9, 24, 23, 30), // 00:30 BST
      Date.UTC(2026, 9, 25, 0, 30), // 01:30 BST
      Date.UTC(2026, 9, 25, 1, 30), // 01:30 GMT
      Date.UTC(2026, 9, 25, 2, 30), // 02:30 GMT
    ]);
  });
});

describe('parseForecastTable refuses, naming line, column, value and why', () => {
  it('a value that is not a number, a date that does not exist, a negative speed and a gust below the mean', () => {
    const text = 'time,mean,gust\n2026-06-13T12:00Z,5,abc\n2026-02-30T12:00Z,5,9\n2026-06-13T14:00Z,-1,9\n2026-06-13T15:00Z,12,10\n';
    const problems = problemsOf(parseForecastTable(text, { unit: 'm/s' }));
    expect(problems.map(({ line, column, value }) => [line, column, value])).toEqual([
      [2, 'gust', 'abc'],
      [3, 'time', '2026-02-30T12:00Z'],
      [4, 'mean', '-1'],
      [5, 'gust', '10'],
    ]);
    expect(problems[0]!.message).toBe('line 2, column "gust": "abc": not a number (use a decimal point)');
    expect(problems[1]!.reason).toMatch(/day 30 does not exist/);
    expect(problems[3]!.reason).toMatch(/below the mean/);
  });

  it('a decimal comma in a comma-separated table (it would split the field)', () => {
    const problems = problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,12,5\n', { unit: 'm/s' }));
    expect(problems[0]).toMatchObject({ line: 2, column: null });
    expect(problems[0]!.reason).toMatch(/3 fields but the header has 2/);
  });

  it('a speed above the plausible 120 m/s, which usually means a wrong unit (design.md §3)', () => {
    const [problem] = problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,130\n', { unit: 'm/s' }));
    expect(problem).toMatchObject({ line: 2, column: 'gust', value: '130' });
    expect(problem!.reason).toMatch(/above the plausible 120 m\/s/);
  });

  it('a local time with no time zone', () => {
    const [problem] = problemsOf(parseForecastTable('time,gust\n2026-06-13 12:00,10\n', { unit: 'm/s' }));
    expect(problem!.reason).toMatch(/local time without a time zone/);
  });

  it('a time it cannot read, such as day/month/year', () => {
    const [problem] = problemsOf(parseForecastTable('time,gust\n13/06/2026 12:00,10\n', { unit: 'm/s' }));
    expect(problem).toMatchObject({ line: 2, column: 'time', value: '13/06/2026 12:00' });
  });

  it('a direction that is neither degrees 0..360 nor a compass point', () => {
    const problems = problemsOf(parseForecastTable('time;gust;dir\n2026-06-13T12:00Z;10;NXE\n2026-06-13T13:00Z;10;361\n', { unit: 'm/s' }));
    expect(problems.map((p) => [p.line, p.column, p.value])).toEqual([
      [2, 'dir', 'NXE'],
      [3, 'dir', '361'],
    ]);
  });

  it('a repeated time', () => {
    const [problem] = problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,10\n2026-06-13T13:00+01:00,11\n', { unit: 'm/s' }));
    expect(problem).toMatchObject({ line: 3, column: 'time' });
    expect(problem!.reason).toMatch(/same time as line 2/);
  });

  it('speeds with no unit, an unknown unit, and a header unit that contradicts the chosen one', () => {
    expect(problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,10\n'))[0]!.reason).toMatch(/no speed unit/);
    expect(problemsOf(parseForecastTable('time,gust (furlongs)\n2026-06-13T12:00Z,10\n'))[0]).toMatchObject({
      line: 1,
      column: 'gust (furlongs)',
    });
    expect(problemsOf(parseForecastTable('time,gust (kn)\n2026-06-13T12:00Z,10\n', { unit: 'km/h' }))[0]!.reason).toMatch(
      /header says kn but the chosen unit is km\/h/,
    );
  });

  it('a header without a time column, without a wind column, or naming a column twice', () => {
    expect(problemsOf(parseForecastTable('when,gust\nx,1\n', { unit: 'm/s' })).map((p) => p.reason).join()).toMatch(/no time column/);
    expect(problemsOf(parseForecastTable('time,rain\nx,1\n')).map((p) => p.reason).join()).toMatch(/no wind column/);
    const twice = problemsOf(parseForecastTable('time,gust,max gust\nx,1,2\n', { unit: 'm/s' }));
    expect(twice[0]).toMatchObject({ line: 1, column: 'max gust' });
  });

  it('a first line that is data, not a header', () => {
    expect(problemsOf(parseForecastTable('2026-06-13T12:00Z,10\n', { unit: 'm/s' }))[0]!.reason).toMatch(/header row/);
    expect(problemsOf(parseForecastTable('12.5;2026-06-13T12:00Z\n', { unit: 'm/s' }))[0]!.reason).toMatch(/header row/);
  });

  it('an empty table, a header with no rows, and more than 1000 rows', () => {
    expect(problemsOf(parseForecastTable(''))[0]!.reason).toMatch(/empty/);
    expect(problemsOf(parseForecastTable('  \n\n'))[0]!.reason).toMatch(/empty/);
    expect(problemsOf(parseForecastTable('time,gust\n', { unit: 'm/s' }))[0]!.reason).toMatch(/no rows/);
    const rows = (count: number) =>
      Array.from({ length: count }, (_, i) => `${new Date(Date.UTC(2026, 5, 1) + i * 3_600_000).toISOString()},10`).join('\n');
    expect(rowsOf(parseForecastTable(`time,gust\n${rows(maxForecastRows)}`, { unit: 'm/s' }))).toHaveLength(1000);
    expect(problemsOf(parseForecastTable(`time,gust\n${rows(1001)}`, { unit: 'm/s' }))[0]!.reason).toMatch(/1001 rows; at most 1000/);
  });

  it('at most 50 problems, then how many more', () => {
    const text = `time,gust\n${Array.from({ length: 80 }, (_, i) => `2026-06-13T12:${String(i % 60).padStart(2, '0')}Z,x`).join('\n')}`;
    const problems = problemsOf(parseForecastTable(text, { unit: 'm/s' }));
    expect(problems).toHaveLength(51);
    expect(problems[50]!.reason).toBe('30 more problems not shown');
  });

  it('throws a RangeError for an unknown unit or time zone argument (a programming error, not bad content)', () => {
    expect(() => parseForecastTable('time,gust\n', { unit: 'furlong/fortnight' as never })).toThrow(/options\.unit/);
    expect(() => parseForecastTable('time,gust\n', { timeZone: 'Mars/Olympus' })).toThrow(/Mars\/Olympus/);
  });
});
