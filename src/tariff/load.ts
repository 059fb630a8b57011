/**
 * Reads a tariff file (format: docs/tariffs.md) into a validated `Tariff`.
 * Strict by design: an unknown key, a rate for an undefined period, blocks out of order or
 * versions out of order are errors with file:line:column and a hint, never guesses.
 * The parts live in load-calendar.ts, load-charges.ts and load-versions.ts.
 */
import { LineCounter, parseDocument, type Node } from "yaml";
import type { InputIssue } from "../core/issues.ts";
import { COMMODITIES, type Commodity } from "../domain/types.ts";
import { checkVersion, checkVersionOrder, readVersion, resolveVersions, type RawVersion } from "./load-versions.ts";
import type { Tariff, TariffVersion } from "./model.ts";
import { canonicalUnit, UNITS_BY_COMMODITY } from "./units.ts";
import { Checker, didYouMean, readMap, readNumber, readSeq, readString, where, yamlLimitProblem, type Field } from "./yaml-check.ts";
import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF } from "../core/units.ts";

export { MINIMUM_BILL_LABEL } from "./model.ts";

const TOP_KEYS = ["id", "name", "commodity", "usage_unit", "currency", "heat_content", "versions"];

/**
 * Parses and validates a tariff file.
 *
 * @param text file contents (YAML)
 * @param file path as the user gave it, used in every issue
 * @returns the tariff (null when there is any error) and every issue found, with positions
 * @example loadTariff("id: x\n…", "tariffs/x.yaml").issues[0] // { line: 3, column: 5, message: "…" }
 */
export function loadTariff(text: string, file: string): { tariff: Tariff | null; issues: InputIssue[] } {
  const limit = yamlLimitProblem(text);
  if (limit) return { tariff: null, issues: [{ file, line: limit.line, column: limit.column, severity: "error", message: limit.message, hint: limit.hint }] };
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  const c = new Checker(file, lineCounter);
  if (doc.errors.length > 0) {
    for (const e of doc.errors) {
      const p = e.linePos?.[0] ?? lineCounter.linePos(e.pos[0]);
      c.issues.push({
        file,
        line: p.line,
        column: p.col,
        severity: "error",
        message: e.code === "DUPLICATE_KEY" ? `key '${(/^[^:\n]*/.exec(text.slice(e.pos[0]))?.[0] ?? "").trim()}' appears twice in the same mapping` : `YAML syntax: ${e.message.split("\n")[0]}`,
        hint: e.code === "DUPLICATE_KEY" ? "keep one of them" : "check indentation (spaces, not tabs), colons and quotes near this position",
      });
    }
    return { tariff: null, issues: [...c.issues].sort((a, b) => a.line - b.line || a.column - b.column) };
  }
  if (doc.contents === null) {
    c.issues.push({ file, line: 0, column: 0, severity: "error", message: "the tariff file is empty", hint: "start with id:, commodity:, usage_unit: and versions:" });
    return { tariff: null, issues: c.issues };
  }
  const tariff = readTariff(c, doc.contents as Node, file);
  // Report in file order, as an editor would list them.
  const issues = [...c.issues].sort((a, b) => a.line - b.line || a.column - b.column);
  return { tariff: c.failed ? null : tariff, issues };
}

function readTariff(c: Checker, root: Node, file: string): Tariff | null {
  const top = readMap(c, root, TOP_KEYS, "the tariff");
  if (!top) return null;
  const need = (name: string): Field | null => {
    const f = top.get(name);
    if (!f) c.error(root, `missing required key '${name}'`, `a tariff needs ${["id", "commodity", "usage_unit", "versions"].join(", ")}`);
    return f ?? null;
  };
  const idF = need("id");
  const commodityF = need("commodity");
  const unitF = need("usage_unit");
  const versionsF = need("versions");
  const id = idF ? readString(c, idF, "id") : null;
  const nameF = top.get("name");
  const name = nameF ? readString(c, nameF, "name") : id;

  let commodity: Commodity | null = null;
  if (commodityF) {
    const s = readString(c, commodityF, "commodity", `one of ${COMMODITIES.join(", ")}`);
    if (s !== null) {
      if ((COMMODITIES as readonly string[]).includes(s)) commodity = s as Commodity;
      else c.error(where(commodityF), `commodity '${s}' is not known`, `${didYouMean(s, COMMODITIES)}use one of ${COMMODITIES.join(", ")}`);
    }
  }
  let usageUnit: string | null = null;
  if (unitF && commodity) {
    const s = readString(c, unitF, "usage_unit");
    if (s !== null) {
      usageUnit = canonicalUnit(commodity, s);
      if (usageUnit === null) {
        c.error(where(unitF), `usage_unit '${s}' is not a unit for ${commodity}`, `use one of ${UNITS_BY_COMMODITY[commodity].join(", ")}`);
      }
    }
  }
  let currency = "USD";
  const curF = top.get("currency");
  if (curF) {
    const s = readString(c, curF, "currency");
    if (s !== null) {
      if (/^[A-Z]{3}$/.test(s)) currency = s;
      else c.error(where(curF), `currency '${s}' is not an ISO 4217 code`, "three capital letters, e.g. USD");
    }
  }
  let heat = DEFAULT_HEAT_CONTENT_THERM_PER_CCF;
  const heatF = top.get("heat_content");
  if (heatF) {
    if (commodity !== null && commodity !== "gas") {
      // The format's own example carries it on an electricity tariff, so it is not an error.
      c.warning(heatF.key, `heat_content is used for gas only; it has no effect on this ${commodity} tariff`, "remove heat_content");
    }
    {
      const v = readNumber(c, heatF, "heat_content (therm per ccf)", { above: 0 });
      if (v !== null) {
        heat = v;
        if (v < 0.8 || v > 1.3) c.warning(where(heatF), `heat_content ${v} therm/ccf is far from the usual 0.95–1.10`, "check the unit: therm per ccf");
      }
    }
  }

  const rawVersions: RawVersion[] = [];
  if (versionsF) {
    const items = readSeq(c, versionsF.value, "versions", versionsF.key);
    if (items && items.length === 0) c.error(versionsF.key, "versions is empty", "add at least one version with from: and charges:");
    for (const item of items ?? []) rawVersions.push(readVersion(c, item));
  }
  checkVersionOrder(c, rawVersions);
  const resolved = resolveVersions(c, rawVersions);
  const versions: TariffVersion[] = [];
  resolved.forEach((rv, i) => {
    checkVersion(c, rv, commodity);
    const next = rawVersions[i + 1]?.from ?? null;
    versions.push({
      from: rv.raw.from ?? "",
      until: next,
      seasons: rv.seasons,
      holidays: rv.holidays,
      periods: rv.periods.map((p) => p.period),
      charges: rv.charges.map((ch) => ch.parsed.charge),
      minimumBill: rv.minimumBill,
      line: c.pos(rv.raw.node).line,
    });
  });
  if (c.failed || !id || !commodity || !usageUnit) return null;
  return {
    id,
    name: name ?? id,
    commodity,
    usageUnit,
    currency,
    heatContentThermPerCcf: heat,
    heatContentStated: heatF !== undefined,
    versions,
    file,
  };
}

