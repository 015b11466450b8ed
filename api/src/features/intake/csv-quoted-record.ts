/**
 * One CSV record with quoted fields (RFC 4180: a quote inside a quoted value is doubled), starting
 * at `pos` of `s`; null when it does not end within `s` (unless `final`). `lines` counts the line
 * ends inside quoted values too.
 */
export function quotedRecord(s: string, pos: number, final: boolean, eol: '\n' | '\r', d: ',' | ';'): { fields: string[]; next: number; lines: number } | null {
  const fields: string[] = [];
  let lines = 1;
  let i = pos;
  for (;;) {
    let value = '';
    if (s[i] === '"') {
      i++;
      for (;;) {
        const q = s.indexOf('"', i);
        if (q < 0) return null;
        value += s.slice(i, q);
        if (s[q + 1] === '"') {
          value += '"';
          i = q + 2;
        } else {
          i = q + 1;
          break;
        }
      }
      for (let k = value.indexOf(eol); k >= 0; k = value.indexOf(eol, k + 1)) lines++;
    }
    // Unquoted text, or what follows a closing quote, up to the next separator or line end.
    let j = i;
    while (j < s.length && s[j] !== d && s[j] !== eol) j++;
    if (j === s.length && !final) return null;
    let tail = s.slice(i, j);
    if (s[j] !== d && eol === '\n' && tail.charCodeAt(tail.length - 1) === 13) tail = tail.slice(0, -1);
    fields.push(value + tail);
    if (s[j] === d) {
      i = j + 1;
      continue;
    }
    return { fields, next: Math.min(j + 1, s.length), lines };
  }
}
