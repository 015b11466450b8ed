/**
 * Seeded generators of malformed and hostile intake uploads, for hostile-files.test.ts. Every case
 * derives from a valid roster or case list of the test's own codes, or from nothing at all, and is
 * the same on every run for a given seed.
 */

/** mulberry32: a small, well-mixed 32-bit generator; enough to pick cuts, bits and lengths. */
export function prng(seed: number): Rng {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)),
    pick: (xs) => xs[Math.floor(next() * xs.length)]!,
    bytes: (n) => Buffer.from(Array.from({ length: n }, () => Math.floor(next() * 256))),
  };
}

export interface Rng {
  next(): number;
  int(lo: number, hi: number): number;
  pick<T>(xs: readonly T[]): T;
  bytes(n: number): Buffer;
}

export type Kind = 'roster' | 'cases';

/** How a case is sent: a file in a well-formed multipart body (the usual), or a body of its own. */
export type Delivery =
  | { how: 'file'; kind: Kind; file: Buffer; chunked?: boolean }
  | { how: 'raw'; kind: Kind; contentType: string; body: Buffer; query?: string; announced?: number }
  | { how: 'abort'; kind: Kind; contentType: string; sent: Buffer; announced: number };

export interface HostileCase {
  category: string;
  name: string;
  delivery: Delivery;
}

export interface Codes {
  S1: string;
  S2: string;
  GA: string;
  GB: string;
  GC: string;
  OA: string;
  OB: string;
  W: string;
}

export const ROSTER_HEADER = 'worker_key,site,exposure_group,month,hours,birth_year,sex,job_title';
export const CASES_HEADER = 'case_ref,worker_key,outcome,onset_date,status';

/** A valid roster: `workers` workers in January to March 2024 at the first site. */
export function validRoster(k: Codes, workers = 12, eol = '\n'): string {
  const rows: string[] = [ROSTER_HEADER];
  for (let m = 1; m <= 3; m++) {
    for (let w = 1; w <= workers; w++)
      rows.push(
        `${k.W}${String(w).padStart(3, '0')},${k.S1},${[k.GA, k.GB, k.GC][w % 3]},2024-0${m},${150 + w}.5,${1960 + w},${'FMX'[w % 3]},"Operator, line ${w}"`,
      );
  }
  return rows.join(eol) + eol;
}

/** A valid case list for workers of `validRoster`. */
export function validCases(k: Codes, n = 6, eol = '\n'): string {
  const rows: string[] = [CASES_HEADER];
  for (let i = 1; i <= n; i++)
    rows.push(
      `H${i}${k.W},${k.W}${String(i).padStart(3, '0')},${i % 2 ? k.OA : k.OB},2024-0${(i % 3) + 1}-1${i % 10},${['confirmed', 'suspected', 'ruled_out'][i % 3]}`,
    );
  return rows.join(eol) + eol;
}

const file = (kind: Kind, f: Buffer | string, chunked = false): Delivery => ({ how: 'file', kind, file: Buffer.isBuffer(f) ? f : Buffer.from(f), chunked });

/** A roster line with one cell replaced (index into ROSTER_HEADER's columns). */
function rosterWith(k: Codes, col: number, value: string, extra = ''): string {
  const cells = [`${k.W}900`, k.S1, k.GA, '2024-02', '151.25', '1980', 'F', 'Fitter'];
  cells[col] = value;
  return `${ROSTER_HEADER}\n${cells.join(',')}\n${extra}`;
}

function casesWith(k: Codes, col: number, value: string): string {
  const cells = [`H900${k.W}`, `${k.W}001`, k.OA, '2024-02-10', 'confirmed'];
  cells[col] = value;
  return `${CASES_HEADER}\n${cells.join(',')}\n`;
}

/** Every hostile case for the seed; `maxBytes` is the server's upload limit. */
export function hostileCases(seed: number, k: Codes, maxBytes: number): HostileCase[] {
  const r = prng(seed);
  const out: HostileCase[] = [];
  const add = (category: string, name: string, delivery: Delivery) => out.push({ category, name, delivery });
  const roster = Buffer.from(validRoster(k));
  const cases = Buffer.from(validCases(k));
  const base = (kind: Kind) => (kind === 'roster' ? roster : cases);

  // Corruption: random bytes, and bit flips of a valid file.
  for (let i = 0; i < 20; i++) add('corruption', `random bytes ${i}`, file(r.pick(['roster', 'cases'] as const), r.bytes(r.int(1, 6000))));
  for (let i = 0; i < 30; i++) {
    const kind = i % 2 ? 'roster' : 'cases';
    const b = Buffer.from(base(kind));
    const flips = r.int(1, 12);
    for (let f = 0; f < flips; f++) {
      const at = r.int(0, b.length - 1);
      b[at] = b[at]! ^ (1 << r.int(0, 7));
    }
    add('corruption', `${flips} bit flips of a ${kind}`, file(kind, b));
  }

  // Truncation at every kind of point.
  for (const kind of ['roster', 'cases'] as const) {
    const b = base(kind);
    const text = b.toString();
    const header = text.indexOf('\n');
    const points: Array<[string, number]> = [
      ['nothing left', 0],
      ['inside the header', Math.floor(header / 2)],
      ['before the header line end', header],
      ['after the header', header + 1],
      ['inside the first row', header + 7],
      ['before a line end', text.indexOf('\n', header + 1)],
      ['one byte short', b.length - 1],
    ];
    const quote = text.indexOf('"');
    if (quote > 0) points.push(['inside a quoted value', quote + 4]);
    for (let i = 0; i < 6; i++) points.push([`at random point ${i}`, r.int(1, b.length - 1)]);
    for (const [name, at] of points) add('truncation', `${kind} cut ${name}`, file(kind, b.subarray(0, at)));
  }
  const crlf = Buffer.from(validRoster(k, 4, '\r\n'));
  add('truncation', 'roster cut between CR and LF', file('roster', crlf.subarray(0, crlf.indexOf('\r\n', 80) + 1)));
  const utf8 = Buffer.from(rosterWith(k, 7, 'Schwei\u00dfer \u2013 \u{1f525}'));
  add('truncation', 'roster cut inside a multi-byte character', file('roster', utf8.subarray(0, utf8.indexOf(0xf0) + 2)));
  add('truncation', 'cut inside the BOM', file('roster', Buffer.from([0xef, 0xbb])));

  // Encodings.
  const accented = rosterWith(k, 7, 'Soudeur \u00e0 l\u2019arc, \u00e9quipe B');
  add('encoding', 'Latin-1 roster', file('roster', Buffer.from(accented.replace('\u2019', "'"), 'latin1')));
  add('encoding', 'Windows-1252 curly quote', file('roster', Buffer.concat([Buffer.from(rosterWith(k, 7, 'x').slice(0, -2)), Buffer.from([0x92, 0x0a])])));
  for (const [name, kind] of [
    ['roster', 'roster'],
    ['case list', 'cases'],
  ] as const) {
    const t = kind === 'roster' ? accented : validCases(k, 2);
    add('encoding', `UTF-16LE ${name} with BOM`, file(kind, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(t, 'utf16le')])));
    add('encoding', `UTF-16LE ${name} without BOM`, file(kind, Buffer.from(t, 'utf16le')));
    add('encoding', `UTF-16BE ${name} with BOM`, file(kind, Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(t, 'utf16le').swap16()])));
    add(
      'encoding',
      `UTF-32LE ${name}`,
      file(
        kind,
        Buffer.concat([
          Buffer.from([0xff, 0xfe, 0, 0]),
          ...[...t].map((ch) => {
            const x = Buffer.alloc(4);
            x.writeUInt32LE(ch.codePointAt(0)!);
            return x;
          }),
        ]),
      ),
    );
  }
  const invalidUtf8: Array<[string, number[]]> = [
    ['a lone continuation byte', [0x80]],
    ['an overlong slash', [0xc0, 0xaf]],
    ['a UTF-16 surrogate', [0xed, 0xa0, 0x80]],
    ['a code point past U+10FFFF', [0xf4, 0x90, 0x80, 0x80]],
    ['a cut sequence mid-line', [0xe2, 0x82]],
    ['byte 0xFF', [0xff]],
  ];
  for (const [name, bytes] of invalidUtf8) {
    for (const kind of ['roster', 'cases'] as const) {
      const t = kind === 'roster' ? rosterWith(k, 7, 'AAAA') : casesWith(k, 0, 'AAAA');
      const at = t.indexOf('AAAA');
      add('encoding', `${kind} with ${name}`, file(kind, Buffer.concat([Buffer.from(t.slice(0, at)), Buffer.from(bytes), Buffer.from(t.slice(at + 4))])));
    }
  }
  add('encoding', 'header not UTF-8', file('roster', Buffer.concat([Buffer.from('worker_key,si'), Buffer.from([0xe9]), Buffer.from('te\n')])));

  // BOMs.
  const bom = Buffer.from([0xef, 0xbb, 0xbf]);
  for (const kind of ['roster', 'cases'] as const) {
    add('bom', `${kind} with a UTF-8 BOM`, file(kind, Buffer.concat([bom, base(kind)])));
    add('bom', `${kind} with two BOMs`, file(kind, Buffer.concat([bom, bom, base(kind)])));
    const t = base(kind).toString();
    const nl = t.indexOf('\n') + 1;
    add('bom', `${kind} with a BOM at a row start`, file(kind, Buffer.concat([Buffer.from(t.slice(0, nl)), bom, Buffer.from(t.slice(nl))])));
    add('bom', `${kind} with a BOM only`, file(kind, bom));
  }

  // NUL bytes.
  for (const kind of ['roster', 'cases'] as const) {
    const b = base(kind);
    for (const [name, at] of [
      ['in the header', 5],
      ['after the header', b.indexOf(0x0a) + 1],
      ['inside a row', b.indexOf(0x0a) + 9],
      ['at the end', b.length],
      ['inside a later row', b.lastIndexOf(0x0a, b.length - 2) + 3],
    ] as const) {
      add('nul', `${kind} with a NUL byte ${name}`, file(kind, Buffer.concat([b.subarray(0, at), Buffer.from([0]), b.subarray(at)])));
    }
    add('nul', `${kind} of NUL bytes`, file(kind, Buffer.alloc(r.int(10, 3000))));
  }

  // Huge lines and headers.
  add('huge', 'header of 70 KiB without a line end', file('roster', 'worker_key,' + 'x'.repeat(70 * 1024)));
  add('huge', 'header of 70 KiB with a line end', file('roster', `${ROSTER_HEADER},${'y'.repeat(70 * 1024)}\n${k.W}1,${k.S1},${k.GA},2024-01,1,1980,F,x\n`));
  add('huge', 'header of 2,000 columns', file('cases', `${CASES_HEADER},${Array.from({ length: 2000 }, (_, i) => `c${i}`).join(',')}\n`));
  add('huge', 'roster row of 1.2 MiB', file('roster', rosterWith(k, 7, 'z'.repeat(1200 * 1024))));
  add('huge', 'roster job title of 300 characters', file('roster', rosterWith(k, 7, 'j'.repeat(300))));
  add('huge', 'case line of 1.2 MiB', file('cases', casesWith(k, 0, 'C'.repeat(1200 * 1024))));
  add('huge', 'worker key of 65 characters', file('roster', rosterWith(k, 0, `${k.W}${'k'.repeat(65)}`)));
  add('huge', 'quoted value spanning 5,000 lines', file('roster', rosterWith(k, 7, `"${'line\n'.repeat(5000)}"`)));
  add('huge', 'a million separators', file('cases', `${CASES_HEADER}\n${','.repeat(1_000_000)}\n`));

  // COPY escapes.
  const copyEscapes = ['\\.', '\\N', '\\', '\\\\', '\\t', 'a\\.b', '\\.\\.', '\\r\\n', '\\0', '\\x41', '\\101', 'tab\there'];
  for (const e of copyEscapes) {
    add('copy escapes', `roster job title ${JSON.stringify(e)}`, file('roster', rosterWith(k, 7, e.includes('\t') ? `"${e}"` : e)));
    add('copy escapes', `case ref ${JSON.stringify(e)}`, file('cases', casesWith(k, 0, e)));
  }
  for (const eol of ['\n', '\r\n', '\r']) {
    const lines = validCases(k, 4, eol).split(eol);
    lines.splice(2, 0, '\\.');
    add('copy escapes', `case list with a \\. line (${JSON.stringify(eol)})`, file('cases', lines.join(eol)));
    const rl = validRoster(k, 3, eol).split(eol);
    rl.splice(3, 0, '\\.');
    add('copy escapes', `roster with a \\. line (${JSON.stringify(eol)})`, file('roster', rl.join(eol)));
  }
  add('copy escapes', 'case list with \\. inside a quoted value', file('cases', `${CASES_HEADER}\n"H1\n\\.\n",${k.W}001,${k.OA},2024-01-11,confirmed\n`));
  add('copy escapes', 'case list ending in \\. without a line end', file('cases', `${validCases(k, 2)}\\.`));
  add(
    'copy escapes',
    'status \\N and empty',
    file('cases', `${CASES_HEADER}\nH1${k.W},${k.W}001,${k.OA},2024-01-11,\\N\nH2${k.W},${k.W}002,${k.OA},2024-01-12,\n`),
  );

  // Formula cells.
  for (const f of ["=cmd|' /C calc'!A0", '+1+1', '-2+3', '@SUM(A1:A2)', '=HYPERLINK("http://x.invalid")', '\t=1']) {
    add('formula', `roster job title ${JSON.stringify(f)}`, file('roster', rosterWith(k, 7, `"${f.replace(/"/g, '""')}"`)));
    add('formula', `worker key ${JSON.stringify(f)}`, file('roster', rosterWith(k, 0, `"${f.replace(/"/g, '""')}"`)));
  }
  add('formula', 'case ref =1+1', file('cases', casesWith(k, 0, '=1+1')));
  add('formula', 'case status @x', file('cases', casesWith(k, 4, '@x')));

  // Mixed line endings.
  for (const kind of ['roster', 'cases'] as const) {
    const t = base(kind).toString();
    const lines = t.split('\n');
    add('line endings', `${kind}: CRLF header, LF rows`, file(kind, lines[0] + '\r\n' + lines.slice(1).join('\n')));
    add('line endings', `${kind}: LF header, one CRLF row`, file(kind, lines.map((l, i) => (i === 2 ? `${l}\r` : l)).join('\n')));
    add('line endings', `${kind}: CR only`, file(kind, t.replace(/\n/g, '\r')));
    add('line endings', `${kind}: CR header, LF rows`, file(kind, lines[0] + '\r' + lines.slice(1).join('\n')));
    add('line endings', `${kind}: a stray CR inside a row`, file(kind, t.replace(/,2024-0/, ',\r2024-0')));
    add('line endings', `${kind}: LF CR`, file(kind, t.replace(/\n/g, '\n\r')));
    add('line endings', `${kind}: blank lines`, file(kind, t.replace(/\n/, '\n\n\n')));
  }

  // Oversize: announced (refused before reading), unannounced (chunked), and just over the limit.
  add('oversize', 'announced, twice the limit', {
    how: 'raw',
    kind: 'roster',
    contentType: `multipart/form-data; boundary=ratewarden-test-boundary`,
    body: roster,
    announced: maxBytes * 2,
  });
  add(
    'oversize',
    'just over the limit',
    file('roster', Buffer.concat([Buffer.from(ROSTER_HEADER + '\n'), Buffer.alloc(maxBytes - ROSTER_HEADER.length, '\n')])),
  );
  add('oversize', 'chunked, over the limit', file('cases', Buffer.concat([cases, Buffer.alloc(maxBytes + 4096, 'b')]), true));
  add(
    'oversize',
    'chunked, over the limit in rows',
    file('roster', Buffer.concat([roster, Buffer.from(`${k.W}001,${k.S1},${k.GA},2024-01,1,1961,M,x\n`.repeat(Math.ceil(maxBytes / 40)))]), true),
  );

  // Broken multipart bodies and other bodies.
  const B = 'ratewarden-test-boundary';
  const mp = `multipart/form-data; boundary=${B}`;
  const part = (content: Buffer | string, name = 'upload.csv') =>
    Buffer.concat([
      Buffer.from(`--${B}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: text/csv\r\n\r\n`),
      Buffer.from(content),
      Buffer.from('\r\n'),
    ]);
  const closeB = Buffer.from(`--${B}--\r\n`);
  const whole = Buffer.concat([part(roster), closeB]);
  const raw = (name: string, body: Buffer, contentType = mp, query?: string) =>
    add('multipart', name, { how: 'raw', kind: 'roster', contentType, body, query });
  raw('no closing boundary', whole.subarray(0, whole.length - closeB.length));
  for (let i = 0; i < 6; i++) raw(`cut at random point ${i}`, whole.subarray(0, r.int(1, whole.length - 1)));
  raw('no boundary parameter', whole, 'multipart/form-data');
  raw('a boundary that never appears', whole, 'multipart/form-data; boundary=elsewhere');
  raw('an empty boundary', whole, 'multipart/form-data; boundary=');
  raw('no file part', Buffer.from(`--${B}\r\nContent-Disposition: form-data; name="note"\r\n\r\nhello\r\n--${B}--\r\n`));
  raw('an empty body', Buffer.alloc(0));
  raw('two files', Buffer.concat([part(roster, 'a.csv'), part(cases, 'b.csv'), closeB]));
  raw('two files, the second cut', Buffer.concat([part(validRoster(k, 2), 'a.csv'), part(cases, 'b.csv').subarray(0, 40)]));
  raw('a part without headers', Buffer.from(`--${B}\r\n\r\n${validRoster(k, 1)}\r\n--${B}--\r\n`));
  raw('a part header without its end', Buffer.from(`--${B}\r\nContent-Disposition: form-data; name="file"; filename="x.csv"\r\n`));
  raw(
    '41 fields',
    Buffer.concat([
      ...Array.from({ length: 41 }, (_, i) => Buffer.from(`--${B}\r\nContent-Disposition: form-data; name="f${i}"\r\n\r\nv\r\n`)),
      part(roster),
      closeB,
    ]),
  );
  raw('garbage under a multipart type', r.bytes(3000));
  raw('a file name of 2,000 characters', Buffer.concat([part(validRoster(k, 1), 'n'.repeat(2000)), closeB]));
  raw('a CSV body as text/csv', roster, 'text/csv');
  raw('a JSON body', Buffer.from('{"rows":[]}'), 'application/json');
  raw('broken JSON', Buffer.from('{"rows":'), 'application/json');
  raw('JSON over its limit', Buffer.alloc(1_100_000, ' '), 'application/json');
  raw('no content type', roster, '');
  raw('an unknown kind', whole, mp, 'kind=payroll&mode=check');
  raw('an unknown mode', whole, mp, 'kind=roster&mode=maybe');
  for (const sent of [0, 30, 200, 2000]) {
    add('multipart', `connection dropped after ${sent} of ${whole.length + 50_000} bytes`, {
      how: 'abort',
      kind: 'roster',
      contentType: mp,
      sent: whole.subarray(0, sent),
      announced: whole.length + 50_000,
    });
  }

  // Wrong column counts, duplicate and odd headers.
  for (const kind of ['roster', 'cases'] as const) {
    const t = base(kind).toString();
    const lines = t.split('\n');
    add('columns', `${kind}: a row with a field less`, file(kind, lines.map((l, i) => (i === 2 ? l.replace(/,[^,]*$/, '') : l)).join('\n')));
    add('columns', `${kind}: a row with a field more`, file(kind, lines.map((l, i) => (i === 3 ? `${l},extra` : l)).join('\n')));
    add('columns', `${kind}: a row of one field`, file(kind, lines.map((l, i) => (i === 2 ? 'lonely' : l)).join('\n')));
    add('columns', `${kind}: trailing separators`, file(kind, lines.map((l, i) => (i > 0 && l ? `${l},,` : l)).join('\n')));
    add('columns', `${kind}: semicolons in a comma file`, file(kind, lines.map((l, i) => (i === 2 ? l.replace(/,/g, ';') : l)).join('\n')));
    add('columns', `${kind}: an unclosed quote`, file(kind, lines.map((l, i) => (i === 2 ? `"${l}` : l)).join('\n')));
    add('columns', `${kind}: a quote in an unquoted value`, file(kind, lines.map((l, i) => (i === 2 ? l.replace(',', ',a"b') : l)).join('\n')));
    const h = lines[0]!;
    const first = h.split(',')[0]!;
    add('headers', `${kind}: a column twice`, file(kind, [`${h},${first}`, ...lines.slice(1).map((l) => (l ? `${l},x` : l))].join('\n')));
    add(
      'headers',
      `${kind}: a column twice in other case`,
      file(kind, [`${h},${first.toUpperCase()}`, ...lines.slice(1).map((l) => (l ? `${l},x` : l))].join('\n')),
    );
    add('headers', `${kind}: an unknown column`, file(kind, [`${h},shoe_size`, ...lines.slice(1).map((l) => (l ? `${l},42` : l))].join('\n')));
    add('headers', `${kind}: a required column missing`, file(kind, lines.map((l) => l.split(',').slice(1).join(',')).join('\n')));
    add('headers', `${kind}: an empty column name`, file(kind, [`${h},`, ...lines.slice(1).map((l) => (l ? `${l},` : l))].join('\n')));
    add('headers', `${kind}: header only`, file(kind, `${h}\n`));
    add('headers', `${kind}: header quoted oddly`, file(kind, [`"${h}`, ...lines.slice(1)].join('\n')));
    add('headers', `${kind}: semicolon header, comma rows`, file(kind, [h.replace(/,/g, ';'), ...lines.slice(1)].join('\n')));
  }
  add('headers', 'an empty file', file('roster', ''));
  add('headers', 'a line end only', file('cases', '\n'));

  // Empty fields.
  for (let col = 0; col < 8; col++) add('empty fields', `roster column ${col} empty`, file('roster', rosterWith(k, col, '')));
  for (let col = 0; col < 5; col++) add('empty fields', `case column ${col} empty`, file('cases', casesWith(k, col, '')));
  add('empty fields', 'roster row of separators', file('roster', `${ROSTER_HEADER}\n,,,,,,,\n`));
  add('empty fields', 'quoted empty strings', file('cases', `${CASES_HEADER}\n"","","","",""\n`));
  add('empty fields', 'spaces only', file('roster', rosterWith(k, 4, '   ')));

  // Far past, far future and zero dates.
  for (const m of [
    '0000-01',
    '0001-01',
    '1000-06',
    '1949-12',
    '1950-01',
    '2099-12',
    '2100-01',
    '2999-01',
    '9999-12',
    '2024-00',
    '2024-13',
    '-2024-01',
    '20240-01',
    '2024-1',
    '２０２４-01',
  ]) {
    add('dates', `roster month ${m}`, file('roster', rosterWith(k, 3, m)));
  }
  for (const d of [
    '0000-01-01',
    '0000-02-29',
    '0001-01-01',
    '1899-12-31',
    '1900-01-01',
    '2099-12-31',
    '2100-01-01',
    '9999-12-31',
    '2024-02-30',
    '2023-02-29',
    '2024-01-00',
    '2024-01-32',
    '2024-1-5',
    '10000-01-01',
    '2024-06-15T10:00:00',
  ]) {
    add('dates', `onset ${d}`, file('cases', casesWith(k, 3, d)));
  }

  // Negative and enormous numbers.
  for (const h of [
    '-1',
    '-0.01',
    '-0',
    '744',
    '744.01',
    '745',
    '1e3',
    '999999999',
    '9999999999',
    '99999999999999999999999999',
    '1.7976931348623157e308',
    'NaN',
    'Infinity',
    '0x10',
    '1.005',
    '+5',
    '"1,5"',
    '1,5',
    '1 000',
    '٣',
  ]) {
    add('numbers', `hours ${h}`, file('roster', rosterWith(k, 4, h)));
  }
  for (const y of ['-1980', '0', '1899', '2101', '2147483648', '-2147483649', '99999999999999999999', '1980.5', '1e3', '32768']) {
    add('numbers', `birth year ${y}`, file('roster', rosterWith(k, 5, y)));
  }
  return out;
}
