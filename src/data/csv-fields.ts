/**
 * One CSV line → its fields and the 1-based column where each starts (RFC 4180 quoting: a field
 * in double quotes may hold commas and doubled quotes; a record must fit on one line).
 */

export type CsvLine = { ok: true; fields: string[]; columns: number[] } | { ok: false; column: number; message: string };

export function splitCsvLine(text: string): CsvLine {
  const fields: string[] = [];
  const columns: number[] = [];
  let i = 0;
  for (;;) {
    columns.push(i + 1);
    if (text[i] === '"') {
      let value = '';
      let j = i + 1;
      for (;;) {
        if (j >= text.length) return { ok: false, column: i + 1, message: 'a quoted field is not closed on its line (records must fit on one line)' };
        if (text[j] === '"') {
          if (text[j + 1] === '"') {
            value += '"';
            j += 2;
            continue;
          }
          break;
        }
        value += text[j];
        j++;
      }
      j++;
      if (j < text.length && text[j] !== ',') return { ok: false, column: j + 1, message: `unexpected '${text[j]}' after a quoted field; expected ','` };
      fields.push(value);
      if (j >= text.length) return { ok: true, fields, columns };
      i = j + 1;
    } else {
      const comma = text.indexOf(',', i);
      const end = comma < 0 ? text.length : comma;
      fields.push(text.slice(i, end));
      if (comma < 0) return { ok: true, fields, columns };
      i = comma + 1;
    }
  }
}

/** A finite number written in decimal (surrounding blanks allowed), or undefined. */
export function numberOf(field: string): number | undefined {
  const t = field.trim();
  if (t === '' || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : undefined;
}
