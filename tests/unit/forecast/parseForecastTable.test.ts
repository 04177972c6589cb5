/**
 * Forecast tables as people paste them: comma, semicolon and tab separated, units in the header
 * or chosen, local or offset times. Unit factors are the exact definitions (1 km/h = 1/3.6 m/s;
 * 1 kn = 1852/3600 m/s, BIPM SI brochure table 8; 1 mph = 0.44704 m/s, 1959 yard and pound
 * agreement). Clock changes in Europe/London follow EU Directive 2000/84/EC and the UK Summer Time
 * Order 2002: summer time from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last
 * Sunday of October (29 March and 25 October in 2026). The tables are invented.
 */
import { describe, expect, it } from 'vitest';
import { maxForecastRows, parseForecastTable, type ForecastTable } from '../../../server/foresight/index.ts';

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
    expect(problems[0]!.message).toBe('Line 2, column 3 (gust): "abc" is not a speed — write a number, with or without its unit (12, 12.5, "8 mph"); units: m/s, km/h, mph or kn');
    expect(problems[1]!.message).toBe('Line 3, column 1 (time): "2026-02-30T12:00Z" is not a date — February 2026 has no day 30');
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

  it('a time it cannot read, such as words', () => {
    const [problem] = problemsOf(parseForecastTable('time,gust\n13 June at noon,10\n', { unit: 'm/s' }));
    expect(problem).toMatchObject({ line: 2, column: 'time', columnNumber: 1, value: '13 June at noon' });
    expect(problem!.message).toMatch(/^Line 2, column 1 \(time\): "13 June at noon" is not a date and time — write 2026-06-12 14:00/);
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

/*
 * Units written inside the cells. Factors are the exact definitions: 1 mile = 1609.344 m
 * (international yard and pound agreement, 1959), so 1 mph = 1609.344/3600 m/s = 0.44704 m/s;
 * 1 nautical mile = 1852 m (SI Brochure, 9th edition, table 8), so 1 kn = 1852/3600 m/s;
 * 1 km/h = 1000/3600 m/s.
 */
const mileM = 1609.344;
const nauticalMileM = 1852;

describe('parseForecastTable reads units inside the cells', () => {
  it('"8 mph", "14 km/h", "12 kn" and "6 m/s" each in a column of its own', () => {
    const text = 'time,mean,gust\n2026-06-13T12:00Z,8 mph,14 mph\n2026-06-13T13:00Z,8mph,20 MPH\n';
    const rows = rowsOf(parseForecastTable(text));
    expect(rows[0]!.meanMps).toBeCloseTo((8 * mileM) / 3600, 12); // 3.57632 m/s
    expect(rows[0]!.gustMps).toBeCloseTo((14 * mileM) / 3600, 12);
    expect(rows[1]!.gustMps).toBeCloseTo((20 * mileM) / 3600, 12);
    const kmh = rowsOf(parseForecastTable('time;gust\n2026-06-13T12:00Z;14 km/h\n2026-06-13T13:00Z;12,5 kph\n'));
    expect(kmh.map((r) => r.gustMps)).toEqual([expect.closeTo(14000 / 3600, 12), expect.closeTo(12500 / 3600, 12)]);
    const kn = rowsOf(parseForecastTable('time\tgust\n2026-06-13T12:00Z\t12 kn\n2026-06-13T13:00Z\t12kt\n2026-06-13T14:00Z\t12 knots\n'));
    for (const row of kn) expect(row.gustMps).toBeCloseTo((12 * nauticalMileM) / 3600, 12); // 6.1733 m/s
    const mps = rowsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,6 m/s\n2026-06-13T13:00Z,6 m s-1\n'));
    expect(mps.map((r) => r.gustMps)).toEqual([6, 6]);
  });

  it('says which unit each column was read in and where that came from', () => {
    const table = parseForecastTable('time,mean (km/h),gust\n2026-06-13T12:00Z,20,30 mph\n');
    expect(table.ok && table.notes).toEqual(['Mean wind (column 2, mean (km/h)): km/h, from the header.', 'Gust (column 3, gust): mph, from the cells.']);
    const chosen = parseForecastTable('time,gust\n2026-06-13T12:00Z,30\n', { unit: 'kn' });
    expect(chosen.ok && chosen.notes).toEqual(['Gust (column 2, gust): kn, as chosen.']);
  });

  it('refuses mixed units in one column rather than converting, naming both lines', () => {
    const cells = problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,8 mph\n2026-06-13T13:00Z,14 km/h\n'));
    expect(cells.map((p) => p.message)).toEqual([
      'Line 3, column 2 (gust): "14 km/h" is in km/h but line 2 of this column is in mph — one unit per column; mixed units are refused, not converted, so convert these cells first',
    ]);
    const header = problemsOf(parseForecastTable('time,gust (km/h)\n2026-06-13T12:00Z,30\n2026-06-13T13:00Z,20 mph\n'));
    expect(header[0]).toMatchObject({ line: 3, columnNumber: 2, value: '20 mph' });
    expect(header[0]!.reason).toMatch(/is in mph but the header says km\/h — one unit per column/);
    const chosen = problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,30 mph\n', { unit: 'km/h' }));
    expect(chosen[0]!.reason).toMatch(/is in mph but the chosen unit is km\/h/);
  });

  it('refuses a bare number among cells with units when the header names none', () => {
    const [problem, ...rest] = problemsOf(parseForecastTable('time,gust\n2026-06-13T12:00Z,8 mph\n2026-06-13T13:00Z,12\n'));
    expect(rest).toEqual([]);
    expect(problem!.message).toBe('Line 3, column 2 (gust): "12" has no unit, but line 2 of this column is in mph — write the unit in every cell ("12 mph"), or in the header');
  });

  it('refuses a misspelt unit with the line, the column and the units it knows', () => {
    const text = 'time,mean,gust\n2026-06-13T12:00Z,5 mph,8 mph\n2026-06-13T13:00Z,5 mph,9 mph\n2026-06-13T14:00Z,5 mph,8 mhp\n';
    const [problem] = problemsOf(parseForecastTable(text));
    // The example of the issue, word for word.
    expect(problem!.message).toBe('Line 4, column 3 (gust): "8 mhp" is not a speed — use m/s, km/h, mph or kn');
  });
});

/*
 * Beaufort: the WMO scale of the 10-minute mean wind at 10 m (WMO-No. 306 code table 1100, as
 * reproduced in WMO-No. 8; ../shared/references.md §4): force 6 is 10.8–13.8 m/s, force 4
 * 5.5–7.9 m/s, force 11 28.5–32.6 m/s, force 12 32.7 m/s and above.
 */
describe('parseForecastTable reads Beaufort forces for the mean wind', () => {
  it('"Bft 6", "6 Bft", "Beaufort 4" and "Force 11" as the top of each band', () => {
    const text = 'time,mean\n2026-06-13T12:00Z,Bft 6\n2026-06-13T13:00Z,6 Bft\n2026-06-13T14:00Z,Beaufort 4\n2026-06-13T15:00Z,Force 11\n';
    expect(rowsOf(parseForecastTable(text)).map((r) => r.meanMps)).toEqual([13.8, 13.8, 7.9, 32.6]);
  });

  it('a header in Beaufort, and says how the forces were read', () => {
    const table = parseForecastTable('time,mean (Bft),gust (m/s)\n2026-06-13T12:00Z,5,18\n');
    expect(rowsOf(table)[0]).toMatchObject({ meanMps: 10.7, gustMps: 18 });
    expect(table.ok && table.notes[0]).toMatch(/Mean wind \(column 2, mean \(Bft\)\): Beaufort forces, from the header; each force is read as the top of its band on the WMO Beaufort scale \(force 6, 10\.8–13\.8 m\/s, as 13\.8 m\/s\)/);
  });

  it('refuses Beaufort for gusts, force 12 (no upper limit), fractions and forces above 12', () => {
    expect(problemsOf(parseForecastTable('time,mean (m/s),gust\n2026-06-13T12:00Z,5,Bft 7\n'))[0]!.reason).toMatch(/describes the mean wind, not gusts/);
    expect(problemsOf(parseForecastTable('time,gust (Beaufort)\n2026-06-13T12:00Z,7\n'))[0]).toMatchObject({ line: 1, columnNumber: 2 });
    const refused = problemsOf(parseForecastTable('time,mean\n2026-06-13T12:00Z,Bft 12\n2026-06-13T13:00Z,Bft 6.5\n2026-06-13T14:00Z,Bft 13\n'));
    expect(refused.map((p) => [p.line, p.value])).toEqual([
      [2, 'Bft 12'],
      [3, 'Bft 6.5'],
      [4, 'Bft 13'],
    ]);
    expect(refused[0]!.reason).toMatch(/no upper limit \(32\.7 m\/s and above\)/);
    expect(refused[1]!.reason).toMatch(/whole numbers from 0 to 12/);
  });
});

describe('parseForecastTable reads a date column and a time column', () => {
  it('"date,time,mean,gust,dir" with local times in the site zone (BST, UTC+1, in June)', () => {
    const text = 'date,time,mean,gust,dir\n2026-06-13,14:00,8 mph,14 mph,SW\n2026-06-13,15:30,9 mph,16 mph,WSW\n';
    const table = parseForecastTable(text, { timeZone: 'Europe/London' });
    expect(rowsOf(table).map((r) => [r.line, r.timeMs, r.dirFromDeg])).toEqual([
      [2, Date.UTC(2026, 5, 13, 13), 225],
      [3, Date.UTC(2026, 5, 13, 14, 30), 247.5],
    ]);
    expect(table.ok && table.notes).toContain('Date from column 1 (date), time of day from column 2 (time).');
    expect(table.ok && table.notes).toContain('Times without an offset are Europe/London time.');
  });

  it('times of day as 9:00, 1400, 2 pm, 12 am and 14:00Z, and an "hour" column', () => {
    const text = 'date,hour,gust (m/s)\n2026-06-13,9:00,5\n2026-06-13,1400,5\n2026-06-13,2:30 pm,5\n2026-06-14,12 am,5\n2026-06-14,14:00Z,5\n';
    expect(rowsOf(parseForecastTable(text, { timeZone: 'UTC' })).map((r) => r.timeMs)).toEqual([
      Date.UTC(2026, 5, 13, 9),
      Date.UTC(2026, 5, 13, 14),
      Date.UTC(2026, 5, 13, 14, 30),
      Date.UTC(2026, 5, 14, 0),
      Date.UTC(2026, 5, 14, 14),
    ]);
  });

  it('the autumn clock change across separate columns (Directive 2000/84/EC: 25 October 2026)', () => {
    const text = 'date;time;gust (m/s)\n2026-10-25;01:30;10\n2026-10-25;01:30;10\n';
    expect(rowsOf(parseForecastTable(text, { timeZone: 'Europe/London' })).map((r) => r.timeMs)).toEqual([Date.UTC(2026, 9, 25, 0, 30), Date.UTC(2026, 9, 25, 1, 30)]);
  });

  it('refuses a date cell with a time, a time cell with a date, empty cells, and a date column alone', () => {
    const problems = problemsOf(parseForecastTable('date,time,gust (m/s)\n2026-06-13 14:00,14:00,5\n2026-06-13,2026-06-13 15:00,5\n,16:00,5\n2026-06-13,,5\n', { timeZone: 'UTC' }));
    expect(problems.map((p) => p.message)).toEqual([
      'Line 2, column 1 (date): "2026-06-13 14:00" holds a time as well — with a separate time column, column 1 holds only the date',
      'Line 3, column 2 (time): "2026-06-13 15:00" holds a date as well — with a separate date column, column 2 holds only the time of day (14:00)',
      'Line 4, column 1 (date): has no date — every row needs one',
      'Line 5, column 2 (time): has no time — every row needs one',
    ]);
    expect(problemsOf(parseForecastTable('date,gust (m/s)\n2026-06-13,5\n'))[0]!.message).toBe(
      'Line 1, column 1 (date): a date column needs a time column beside it — add one named "time" holding the time of day (14:00)',
    );
  });

  it('refuses a bare hour ("14") and a time of day out of range', () => {
    const problems = problemsOf(parseForecastTable('date,time,gust (m/s)\n2026-06-13,14,5\n2026-06-13,24:00,5\n2026-06-13,13 pm,5\n', { timeZone: 'UTC' }));
    expect(problems.map((p) => [p.line, p.columnNumber])).toEqual([
      [2, 2],
      [3, 2],
      [4, 2],
    ]);
    expect(problems[1]!.reason).toMatch(/hours run from 0 to 23/);
    expect(problems[2]!.reason).toMatch(/with am or pm the hour runs from 1 to 12/);
  });
});

describe('parseForecastTable reads year-last dates only in a stated order', () => {
  const twoDays = 'date,time,gust (m/s)\n03/12/2026,14:00,10\n04/12/2026,14:00,11\n';

  it('refuses a table where both orders fit, with both readings in words', () => {
    const problems = problemsOf(parseForecastTable(twoDays, { timeZone: 'UTC' }));
    expect(problems.map((p) => p.message)).toEqual([
      'Line 2, column 1 (date): "03/12/2026" could be 3 December 2026 (day first) or 12 March 2026 (month first), and no date in the table settles it — choose the date order, name it in the header ("date (dd/mm/yyyy)"), or write dates as 2026-MM-DD',
    ]);
  });

  it('reads the order the user chose, and says so', () => {
    const dayFirst = parseForecastTable(twoDays, { timeZone: 'UTC', dateOrder: 'day-first' });
    expect(rowsOf(dayFirst).map((r) => r.timeMs)).toEqual([Date.UTC(2026, 11, 3, 14), Date.UTC(2026, 11, 4, 14)]);
    expect(dayFirst.ok && dayFirst.dateOrder).toBe('day-first');
    expect(dayFirst.ok && dayFirst.notes).toContain('Dates read day first (day/month/year), as chosen.');
    const monthFirst = parseForecastTable(twoDays, { timeZone: 'UTC', dateOrder: 'month-first' });
    expect(rowsOf(monthFirst).map((r) => r.timeMs)).toEqual([Date.UTC(2026, 2, 12, 14), Date.UTC(2026, 3, 12, 14)]);
  });

  it('detects the order from a date that fits only one, and names that line', () => {
    const table = parseForecastTable(`${twoDays}13/12/2026,14:00,12\n`, { timeZone: 'UTC' });
    expect(rowsOf(table).map((r) => r.timeMs)).toEqual([Date.UTC(2026, 11, 3, 14), Date.UTC(2026, 11, 4, 14), Date.UTC(2026, 11, 13, 14)]);
    expect(table.ok && table.notes).toContain('Dates read day first (day/month/year): line 4 has 13/12/2026, and there is no month 13.');
    const us = parseForecastTable('time,gust (mph)\n12/03/2026 2:00 PM,20\n12/13/2026 2:00 PM,20\n', { timeZone: 'America/New_York' });
    // 14:00 Eastern Standard Time (UTC−5) in December.
    expect(rowsOf(us).map((r) => r.timeMs)).toEqual([Date.UTC(2026, 11, 3, 19), Date.UTC(2026, 11, 13, 19)]);
    expect(us.ok && us.dateOrder).toBe('month-first');
  });

  it('reads the order named in the header ("dd/mm/yyyy", "mm.dd.yyyy")', () => {
    const table = parseForecastTable('date (dd/mm/yyyy);time (UTC);gust (kn)\n03/12/2026;14:00;20\n', {});
    expect(rowsOf(table)[0]!.timeMs).toBe(Date.UTC(2026, 11, 3, 14));
    expect(table.ok && table.notes).toContain('Dates read day first (day/month/year), as the header says.');
    expect(rowsOf(parseForecastTable('date [MM.DD.YYYY],time,gust (kn)\n03.12.2026,14:00,20\n', { timeZone: 'UTC' }))[0]!.timeMs).toBe(Date.UTC(2026, 2, 12, 14));
  });

  it('refuses a date that breaks the stated order, a header that contradicts the chosen order, and dates that follow no one order', () => {
    const broken = problemsOf(parseForecastTable('date,time,gust (m/s)\n13/12/2026,14:00,10\n', { timeZone: 'UTC', dateOrder: 'month-first' }));
    expect(broken[0]!.message).toBe('Line 2, column 1 (date): "13/12/2026" is not a date — there is no month 13 when dates are read month first (month/day/year)');
    const header = problemsOf(parseForecastTable('date (dd/mm/yyyy),time,gust (m/s)\n03/12/2026,14:00,10\n', { timeZone: 'UTC', dateOrder: 'month-first' }));
    expect(header[0]!.reason).toMatch(/the header says dates are day first .* but the chosen order is month first/);
    const both = problemsOf(parseForecastTable('date,time,gust (m/s)\n13/12/2026,14:00,10\n12/14/2026,14:00,10\n', { timeZone: 'UTC' }));
    expect(both[0]!.message).toMatch(/^Line 3, column 1 \(date\): "12\/14\/2026" fits only month first, but line 2 \("13\/12\/2026"\) fits only day first — the dates do not follow one order/);
  });

  it('needs no order when day and month are the same, and refuses two-digit years', () => {
    const same = parseForecastTable('date,time,gust (m/s)\n03/03/2026,14:00,10\n', { timeZone: 'UTC' });
    expect(rowsOf(same)[0]!.timeMs).toBe(Date.UTC(2026, 2, 3, 14));
    expect(same.ok && same.dateOrder).toBeNull();
    expect(problemsOf(parseForecastTable('date,time,gust (m/s)\n03/12/26,14:00,10\n', { timeZone: 'UTC', dateOrder: 'day-first' }))[0]!.reason).toMatch(/two-digit year/);
  });
});

describe('parseForecastTable problem messages', () => {
  it('start with the line and the column in words, or with a capital for the whole table', () => {
    const text = 'time,mean,gust (m/s),dir\n2026-06-13T12:00Z,x,5,NXE\n2026-06-13T13:00Z,3,4\n';
    const problems = problemsOf(parseForecastTable(text, { unit: 'm/s' }));
    expect(problems.map((p) => p.message)).toEqual([
      'Line 2, column 2 (mean): "x" is not a speed — write a number, with or without its unit (12, 12.5, "8 mph"); units: m/s, km/h, mph or kn',
      'Line 2, column 4 (dir): "NXE" is not a direction — use degrees 0..360 or a compass point (N, NNE, ... NNW)',
      'Line 3: has 3 fields but the header has 4 — every row needs one field per column',
    ]);
    expect(problemsOf(parseForecastTable(''))[0]!.message).toBe('The table is empty — paste a header row and at least one row');
  });
});
