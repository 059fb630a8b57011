/**
 * One rule for every identifier read from any input file (meter_id, building_id, bill_id,
 * station_id, tariff ids, alignment keys): surrounding whitespace of every Unicode kind is
 * dropped, so an id copied from a spreadsheet with a trailing no-break space matches the same
 * id typed plainly in another file.
 *
 * Removed at both ends: everything JavaScript's `String.prototype.trim` removes (ECMAScript
 * WhiteSpace and LineTerminator: tab, space, U+00A0 no-break space, U+FEFF byte order mark,
 * U+1680, U+2000–U+200A, U+2028, U+2029, U+202F, U+205F, U+3000, …) plus the invisible
 * format characters that copy-paste leaves behind and that no one types on purpose:
 * U+180E, U+200B–U+200D and U+2060 (common practice; Unicode lists them as format, not space).
 */
const EDGE = /^[\s\u180E\u200B-\u200D\u2060]+|[\s\u180E\u200B-\u200D\u2060]+$/g;

/**
 * Trims an identifier the same way in every file.
 * @example trimId("M1\u00A0") === "M1"; trimId("\uFEFF M1 ") === "M1"; trimId("A B") === "A B"
 */
export function trimId(raw: string): string {
  return raw.replace(EDGE, "");
}

