/**
 * Splits one CSV line into fields following RFC 4180 quoting ("a ""b""",c → `a "b"`, `c`).
 * Used for headers and for the rare quoted line of the fast interval reader.
 * Returns `fields: null` with a reason when a quote is unbalanced (a field that would
 * continue on the next line) or text follows a closing quote.
 * Example: splitCsvLine('M1,"2024-01-01T00:00",1.5') → ["M1", "2024-01-01T00:00", "1.5"].
 */
export function splitCsvLine(line: string): { fields: string[] | null; error: string; errorColumn: number } {
  const fields: string[] = [];
  let i = 0;
  const n = line.length;
  for (;;) {
    if (line.charCodeAt(i) === 34) {
      let value = "";
      let j = i + 1;
      for (;;) {
        const q = line.indexOf('"', j);
        if (q === -1) return { fields: null, error: "a quoted field is not closed on this line", errorColumn: fields.length + 1 };
        value += line.slice(j, q);
        if (line.charCodeAt(q + 1) === 34) {
          value += '"';
          j = q + 2;
        } else {
          j = q + 1;
          break;
        }
      }
      if (j < n && line.charCodeAt(j) !== 44) {
        return { fields: null, error: "text after a closing quote", errorColumn: fields.length + 1 };
      }
      fields.push(value);
      if (j >= n) break;
      i = j + 1;
    } else {
      const c = line.indexOf(",", i);
      if (c === -1) {
        fields.push(line.slice(i));
        break;
      }
      fields.push(line.slice(i, c));
      i = c + 1;
    }
  }
  return { fields, error: "", errorColumn: 0 };
}
