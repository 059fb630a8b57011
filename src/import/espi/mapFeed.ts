/**
 * First pass over an ESPI feed: collects its resources (everything but the interval readings),
 * links them (UsagePoint ← MeterReading → ReadingType, IntervalBlock → MeterReading, usage summary
 * → UsagePoint, UsagePoint → LocalTimeParameters) and maps them to ohmbook meters and bills.
 * Every value that cannot be mapped becomes an error issue with the file's line and a hint.
 */
import { createHash } from "node:crypto";
import { addDays, localPartsOf, offsetAtMs } from "../../core/time/index.ts";
import type { Commodity } from "../../domain/types.ts";
import type { InputIssue } from "../../core/issues.ts";
import {
  ACCUMULATION_DELTA, CURRENCY, ESTIMATED_QUALITY, FLOW_FORWARD, POWER_OF_TEN, SERVICE_KIND, SERVICE_KIND_NAMES, UOM, UOM_NAMES,
} from "./codes.ts";
import { isIntegerText, moneyFromHundredThousandths, shiftDecimal } from "./decimal.ts";
import { type FeedEntry, type XmlNode, child, readEspiFeed } from "./readFeed.ts";

/** Where the mapped rows go: the building and its zone, and the portfolio's currency. */
export interface MapContext {
  /** Path shown in messages. */
  fileLabel: string;
  buildingId: string;
  zone: string;
  currency: string;
}

/** An ohmbook meter made from one usage point and one reading type. */
export interface PlannedMeter {
  meterId: string;
  commodity: Commodity;
  unit: string;
  /** Power of ten taking a reading's integer to `unit` (powerOfTenMultiplier + unit conversion). */
  power: number;
  /** ReadingType intervalLength in seconds, or null when not stated. */
  intervalSeconds: number | null;
  usagePointKey: string;
  line: number;
}

export interface PlannedBill {
  meterId: string;
  billId: string;
  periodStart: string;
  periodEnd: string;
  usage: string;
  total: string;
  readType: "actual" | "estimated";
  lines: { label: string; amount: string }[];
  line: number;
}

export interface FeedPlan {
  meters: PlannedMeter[];
  /** Entry ordinal of an IntervalBlock entry → the meter its readings belong to. */
  meterOfEntry: Map<number, PlannedMeter>;
  bills: PlannedBill[];
  issues: InputIssue[];
  entries: number;
  readings: number;
}

interface UsagePointInfo {
  key: string;
  selfHref: string | null;
  entry: FeedEntry;
  node: XmlNode;
  commodity: Commodity | null;
}

interface ReadingTypeInfo {
  href: string | null;
  node: XmlNode;
  unitOk: boolean;
  unit: string;
  power: number;
  intervalSeconds: number | null;
  currency: number | null;
}

const selfOf = (e: FeedEntry): string | null => e.links.find((l) => l.rel === "self")?.href || null;
const upOf = (e: FeedEntry): string | null => e.links.find((l) => l.rel === "up")?.href || null;
const related = (e: FeedEntry): string[] => e.links.filter((l) => l.rel === "related").map((l) => l.href);

/** A stable meter id: building, commodity letter, and 8 hex digits of the usage point and reading type. */
export function espiMeterId(buildingId: string, commodity: Commodity, usagePointKey: string, readingTypeKey: string): string {
  const hash = createHash("sha256").update(`espi|${usagePointKey}|${readingTypeKey}`).digest("hex").slice(0, 8);
  return `${buildingId}-${commodity[0]!.toUpperCase()}-${hash}`;
}

/** The local calendar date nearest to instant `ms` in `zone` (a billing period boundary). */
function nearestLocalDate(ms: number, zone: string): string {
  const local = localPartsOf(ms, zone);
  return local.hour >= 12 ? addDays(local.date, 1) : local.date;
}

/**
 * Reads the feed at `path` without its readings and maps it.
 * @example const plan = await planFeed("Gas.xml", { fileLabel: "Gas.xml", buildingId: "HQ", zone: "America/New_York", currency: "USD" })
 */
export async function planFeed(path: string, ctx: MapContext): Promise<FeedPlan> {
  const entries: FeedEntry[] = [];
  let readings = 0;
  const entryCount = await readEspiFeed(path, {
    entry: (e) => {
      readings += e.readingCount;
      entries.push(e);
    },
  });
  const plan = mapEntries(entries, ctx);
  plan.entries = entryCount;
  plan.readings = readings;
  return plan;
}

/** Maps collected entries to meters and bills (pure; exported for tests). */
function mapEntries(entries: FeedEntry[], ctx: MapContext): FeedPlan {
  const issues: InputIssue[] = [];
  const error = (line: number, message: string, hint: string): void => {
    issues.push({ file: ctx.fileLabel, line, column: 0, severity: "error", message, hint });
  };
  const warn = (line: number, message: string, hint?: string): void => {
    issues.push({ file: ctx.fileLabel, line, column: 0, severity: "warning", message, hint });
  };
  /** An integer field: trimmed text of digits, else an error and null. */
  const int = (node: XmlNode | undefined, what: string, required: boolean, hint: string, parentLine = 0): number | null => {
    if (node === undefined) {
      if (required) error(parentLine, `${what} is missing`, hint);
      return null;
    }
    const text = node.text.trim();
    if (!isIntegerText(text)) {
      error(node.line, `${what} '${text.slice(0, 40)}' is not a whole number`, hint);
      return null;
    }
    return Number(text);
  };

  const usagePoints: UsagePointInfo[] = [];
  const readingTypes: ReadingTypeInfo[] = [];
  const ltps: { href: string | null; node: XmlNode }[] = [];
  const meterReadings: { entry: FeedEntry }[] = [];
  const summaries: { entry: FeedEntry; node: XmlNode }[] = [];
  const blockEntries: FeedEntry[] = [];

  for (const e of entries) {
    if (e.blocks.length > 0) blockEntries.push(e);
    for (const r of e.resources) {
      switch (r.name) {
        case "UsagePoint": {
          const kindNode = child(child(r, "ServiceCategory"), "kind");
          const kind = int(kindNode, "UsagePoint ServiceCategory kind", false, "0 electricity, 1 gas, 2 water");
          let commodity: Commodity | null = null;
          if (kindNode === undefined) error(r.line, "UsagePoint has no ServiceCategory kind", "add <ServiceCategory><kind>0</kind></ServiceCategory> (0 electricity, 1 gas, 2 water)");
          else if (kind !== null) {
            commodity = SERVICE_KIND[kind] ?? null;
            if (commodity === null) {
              error(kindNode.line, `service kind ${kind} (${SERVICE_KIND_NAMES[kind] ?? "unknown"}) has no ohmbook meter kind`, "ohmbook imports electricity (0), gas (1) and water (2) usage points; leave this file out or remove the usage point");
            }
          }
          const self = selfOf(e);
          usagePoints.push({ key: self ?? e.id ?? `usage-point-${e.ordinal}`, selfHref: self, entry: e, node: r, commodity });
          break;
        }
        case "ReadingType": {
          const uomNode = child(r, "uom");
          const uom = int(uomNode, "ReadingType uom", false, "the unit code of the standard, e.g. 72 for Wh");
          const pNode = child(r, "powerOfTenMultiplier");
          const p = pNode ? int(pNode, "ReadingType powerOfTenMultiplier", false, "a power of ten such as 0, 3 or -3") ?? 0 : 0;
          let unitOk = false;
          let unit = "";
          let power = 0;
          if (uomNode === undefined) error(r.line, "ReadingType has no uom", "add the unit code, e.g. <uom>72</uom> for Wh");
          else if (uom !== null) {
            const m = UOM[uom];
            if (!m) {
              error(uomNode.line, `uom ${uom}${UOM_NAMES[uom] ? ` (${UOM_NAMES[uom]})` : ""} is not a unit of energy or volume that ohmbook meters use`, "ohmbook imports Wh (72), therm (169), US gallon (128), m³ (42) and ft³ (119) readings; leave out this MeterReading");
            } else {
              unitOk = true;
              unit = m.unit;
              power = p + m.shift;
            }
          }
          if (pNode && !POWER_OF_TEN.has(p)) {
            unitOk = false;
            error(pNode.line, `powerOfTenMultiplier ${p} is not one of the schema's multipliers`, "use one of -12, -9, -6, -3, -2, -1, 0, 1, 2, 3, 6, 9, 12");
          }
          const acc = child(r, "accumulationBehaviour");
          const accKind = acc ? int(acc, "accumulationBehaviour", false, "4 (deltaData)") : null;
          if (acc && accKind !== null && accKind !== ACCUMULATION_DELTA) {
            unitOk = false;
            error(acc.line, `accumulationBehaviour ${accKind} is not deltaData (4): readings would be register totals, not the use in each interval`, "export the usage per interval (deltaData) from the utility's portal");
          }
          const flow = child(r, "flowDirection");
          const flowKind = flow ? int(flow, "flowDirection", false, "1 (forward, delivered)") : null;
          if (flow && flowKind !== null && flowKind !== FLOW_FORWARD) {
            unitOk = false;
            error(flow.line, `flowDirection ${flowKind} is not energy delivered to the customer (1, forward)`, "ohmbook has no meters for exported or net energy; leave out this MeterReading");
          }
          const lenNode = child(r, "intervalLength");
          const len = lenNode ? int(lenNode, "intervalLength", false, "seconds, e.g. 900") : null;
          const curNode = child(r, "currency");
          const currency = curNode ? int(curNode, "ReadingType currency", false, "ISO 4217 numeric, e.g. 840") : null;
          const href = selfOf(e);
          readingTypes.push({ href, node: r, unitOk, unit, power, intervalSeconds: len, currency });
          break;
        }
        case "LocalTimeParameters":
          ltps.push({ href: selfOf(e), node: r });
          break;
        case "MeterReading":
          meterReadings.push({ entry: e });
          break;
        case "ElectricPowerUsageSummary":
        case "UsageSummary":
          summaries.push({ entry: e, node: r });
          break;
        default:
          break; // ApplicationInformation, Authorization, customer data …: nothing to import
      }
    }
  }

  if (usagePoints.length === 0 && (blockEntries.length > 0 || summaries.length > 0)) {
    error(entries[0]?.line ?? 1, "the feed has readings or usage summaries but no UsagePoint entry", "download the full feed (with UsagePoint entries) from the utility's Green Button page");
  }
  if (entries.length === 0) error(1, "no Atom entries: this is not an ESPI (Green Button) feed", "give a Green Button 'Download My Data' XML file");

  const byPrefix = <T>(items: T[], hrefOf: (t: T) => string | null, target: string | null): T | undefined => {
    if (target) {
      const hit = items.find((t) => hrefOf(t) === target) ?? items.find((t) => { const h = hrefOf(t); return h !== null && target.startsWith(`${h}/`); });
      if (hit) return hit;
    }
    return items.length === 1 ? items[0] : undefined;
  };

  // The zone check against LocalTimeParameters.
  const checkedLtp = new Set<XmlNode>();
  const checkLtp = (ltp: XmlNode, year: number): void => {
    if (checkedLtp.has(ltp)) return;
    checkedLtp.add(ltp);
    const tz = int(child(ltp, "tzOffset"), "LocalTimeParameters tzOffset", true, "the standard-time offset from UTC in seconds, e.g. -18000", ltp.line);
    const dst = child(ltp, "dstOffset") ? int(child(ltp, "dstOffset"), "LocalTimeParameters dstOffset", false, "seconds, e.g. 3600") : 0;
    if (tz === null) return;
    const jan = offsetAtMs(ctx.zone, Date.UTC(year, 0, 1)) / 1000;
    const jul = offsetAtMs(ctx.zone, Date.UTC(year, 6, 1)) / 1000;
    const standard = Math.min(jan, jul);
    const fmt = (s: number): string => `UTC${s < 0 ? "−" : "+"}${String(Math.floor(Math.abs(s) / 3600)).padStart(2, "0")}:${String((Math.abs(s) % 3600) / 60).padStart(2, "0")}`;
    if (tz !== standard) {
      error(child(ltp, "tzOffset")?.line ?? ltp.line, `LocalTimeParameters say standard time is ${fmt(tz)}, but building ${ctx.buildingId}'s zone ${ctx.zone} has standard time ${fmt(standard)}`,
        "import into the building these meters belong to, or correct its timezone in buildings.csv (or --timezone when the building is new)");
    } else if ((dst ?? 0) !== 0 !== (jan !== jul)) {
      warn(child(ltp, "dstOffset")?.line ?? ltp.line, `LocalTimeParameters say daylight saving ${dst ? "applies" : "does not apply"}, but ${ctx.zone} ${jan !== jul ? "observes" : "does not observe"} it in ${year}`,
        "interval timestamps are UTC in the file and stay exact; check that the building's zone is right");
    }
  };

  // Meters: one per usage point and reading type.
  const meters = new Map<string, PlannedMeter>();
  const meterOfReading = new Map<FeedEntry, PlannedMeter | null>();
  const meterFor = (up: UsagePointInfo, unit: string, power: number, intervalSeconds: number | null, line: number): PlannedMeter | null => {
    if (up.commodity === null) return null;
    const key = `${unit}|${intervalSeconds ?? "-"}`;
    const id = espiMeterId(ctx.buildingId, up.commodity, up.key, key);
    let m = meters.get(id);
    if (!m) {
      m = { meterId: id, commodity: up.commodity, unit, power, intervalSeconds, usagePointKey: up.key, line };
      meters.set(id, m);
    }
    return m;
  };
  const firstYear = new Map<UsagePointInfo, number>();
  for (const { entry } of meterReadings) {
    const up = byPrefix(usagePoints, (u) => u.selfHref, upOf(entry) ?? selfOf(entry));
    const rtHref = related(entry).find((h) => readingTypes.some((r) => r.href === h)) ?? null;
    const rt = rtHref ? readingTypes.find((r) => r.href === rtHref) : readingTypes.length === 1 ? readingTypes[0] : undefined;
    if (!up) {
      error(entry.line, "MeterReading belongs to no UsagePoint of the file", "its 'up' link should start with the UsagePoint's 'self' link");
      meterOfReading.set(entry, null);
      continue;
    }
    if (!rt) {
      error(entry.line, "MeterReading names no ReadingType of the file", "add a 'related' link to the ReadingType entry's 'self' link");
      meterOfReading.set(entry, null);
      continue;
    }
    if (!rt.unitOk || up.commodity === null) {
      meterOfReading.set(entry, null);
      continue;
    }
    if (!UOM[Number(child(rt.node, "uom")?.text.trim())]?.commodities.includes(up.commodity)) {
      error(child(rt.node, "uom")?.line ?? rt.node.line, `unit ${rt.unit} does not measure ${up.commodity} (the UsagePoint's service kind)`, "the ReadingType's uom and the UsagePoint's ServiceCategory kind must agree");
      meterOfReading.set(entry, null);
      continue;
    }
    meterOfReading.set(entry, meterFor(up, rt.unit, rt.power, rt.intervalSeconds, entry.line));
  }

  const meterOfEntry = new Map<number, PlannedMeter>();
  for (const e of blockEntries) {
    const mrEntry = byPrefix(meterReadings, (m) => selfOf(m.entry), upOf(e) ?? selfOf(e))?.entry;
    if (!mrEntry) {
      error(e.line, "IntervalBlock belongs to no MeterReading of the file", "its 'up' link should start with the MeterReading's 'self' link");
      continue;
    }
    const m = meterOfReading.get(mrEntry);
    if (m) meterOfEntry.set(e.ordinal, m);
    const up = usagePoints.find((u) => meters.get(m?.meterId ?? "")?.usagePointKey === u.key);
    const startText = child(child(e.blocks[0], "interval"), "start")?.text.trim();
    if (up && startText && isIntegerText(startText) && !firstYear.has(up)) firstYear.set(up, new Date(Number(startText) * 1000).getUTCFullYear());
  }

  // Bills from usage summaries that state a bill amount.
  const bills: PlannedBill[] = [];
  for (const { entry, node } of summaries) {
    const upHref = upOf(entry);
    const up = byPrefix(usagePoints, (u) => u.selfHref, upHref);
    const billNode = child(node, "billLastPeriod");
    if (!up) {
      error(entry.line, "usage summary belongs to no UsagePoint of the file", "its 'up' link should start with the UsagePoint's 'self' link");
      continue;
    }
    if (billNode === undefined) continue; // no bill amount: nothing to import (the contract maps summaries that state one)
    const billText = billNode.text.trim();
    if (!isIntegerText(billText)) {
      error(billNode.line, `billLastPeriod '${billText.slice(0, 40)}' is not a whole number of 1/100,000 of the currency`, "write the amount as an integer, e.g. 38882000 for 388.82");
      continue;
    }
    const period = child(node, "billingPeriod");
    const start = int(child(period, "start"), "billingPeriod start", false, "Unix seconds (UTC)");
    const duration = int(child(period, "duration"), "billingPeriod duration", false, "seconds");
    if (period === undefined || child(period, "start") === undefined || child(period, "duration") === undefined) {
      error(period?.line ?? node.line, "usage summary has a bill amount but no billingPeriod start and duration", "add <billingPeriod><start>…</start><duration>…</duration></billingPeriod>");
      continue;
    }
    if (start === null || duration === null) continue;
    if (duration <= 0) {
      error(child(period, "duration")!.line, `billingPeriod duration ${duration} s is not positive`, "the length of the billing period in seconds");
      continue;
    }
    const cons = child(node, "overallConsumptionLastPeriod");
    if (!cons || !child(cons, "value")) {
      error(node.line, "usage summary has a bill amount but no overallConsumptionLastPeriod", "bills.csv needs the billed usage: add <overallConsumptionLastPeriod> with uom and value");
      continue;
    }
    const consUom = int(child(cons, "uom"), "overallConsumptionLastPeriod uom", true, "e.g. 72 for Wh", cons.line);
    const consPow = child(cons, "powerOfTenMultiplier") ? int(child(cons, "powerOfTenMultiplier"), "overallConsumptionLastPeriod powerOfTenMultiplier", false, "e.g. 0") : 0;
    const consValue = child(cons, "value")!.text.trim();
    if (!isIntegerText(consValue)) {
      error(child(cons, "value")!.line, `overallConsumptionLastPeriod value '${consValue.slice(0, 40)}' is not a whole number`, "write the usage as an integer scaled by powerOfTenMultiplier");
      continue;
    }
    if (consUom === null || consPow === null) continue;
    const map = UOM[consUom];
    if (!map || up.commodity === null || !map.commodities.includes(up.commodity)) {
      error(child(cons, "uom")?.line ?? cons.line, `overallConsumptionLastPeriod uom ${consUom} is not a unit of ${up.commodity ?? "the usage point's service"} that ohmbook meters use`, "electricity in Wh (72); gas in therm (169), m³ (42) or ft³ (119); water in US gallons (128), m³ or ft³");
      continue;
    }
    const curNode = child(node, "currency");
    const curCode = curNode ? int(curNode, "usage summary currency", false, "ISO 4217 numeric, e.g. 840") : null;
    if (curCode !== null) {
      const alpha = CURRENCY[curCode];
      if (alpha === undefined) {
        error(curNode!.line, `currency ${curCode} is not an ISO 4217 numeric code ohmbook knows`, `known: ${Object.entries(CURRENCY).map(([n, a]) => `${n} ${a}`).join(", ")}`);
        continue;
      }
      if (alpha !== ctx.currency) {
        error(curNode!.line, `the bill is in ${alpha} but the portfolio's currency is ${ctx.currency}`, "set currency in portfolio.yaml, or import into a portfolio in the bill's currency");
        continue;
      }
    }
    const upMeters = [...meters.values()].filter((m) => m.usagePointKey === up.key && m.unit === map.unit).sort((a, b) => (a.intervalSeconds ?? Infinity) - (b.intervalSeconds ?? Infinity));
    const meter = upMeters[0] ?? meterFor(up, map.unit, map.shift, null, entry.line);
    if (!meter) continue;
    const zoneName = ctx.zone;
    const periodStart = nearestLocalDate(start * 1000, zoneName);
    const periodEnd = nearestLocalDate((start + duration) * 1000, zoneName);
    if (periodEnd <= periodStart) {
      error(child(period, "duration")!.line, `billingPeriod of ${duration} s is shorter than a day in ${zoneName}`, "bills.csv periods are whole days");
      continue;
    }
    const lines: { label: string; amount: string }[] = [];
    for (const item of node.children.filter((c) => c.name === "costAdditionalDetailLastPeriod")) {
      const amount = child(item, "amount")?.text.trim() ?? "";
      const note = child(item, "note")?.text.trim() ?? "";
      if (!isIntegerText(amount)) {
        error(child(item, "amount")?.line ?? item.line, `cost detail amount '${amount.slice(0, 40)}' is not a whole number of 1/100,000 of the currency`, "e.g. 1346000 for 13.46");
        continue;
      }
      if (note === "") {
        error(item.line, "cost detail has no note to use as the line's label", "bill_lines.csv matches lines to tariff charges by label: add <note>label</note>");
        continue;
      }
      lines.push({ label: note, amount: moneyFromHundredThousandths(amount) });
    }
    const quality = child(node, "qualityOfReading") ? int(child(node, "qualityOfReading"), "qualityOfReading", false, "a QualityOfReading code, e.g. 14") : null;
    bills.push({
      meterId: meter.meterId,
      billId: `${meter.meterId}:${periodStart}`,
      periodStart,
      periodEnd,
      usage: shiftDecimal(consValue, consPow + map.shift),
      total: moneyFromHundredThousandths(billText),
      readType: quality !== null && ESTIMATED_QUALITY.has(quality) ? "estimated" : "actual",
      lines,
      line: billNode.line,
    });
    const year = new Date(start * 1000).getUTCFullYear();
    if (!firstYear.has(up)) firstYear.set(up, year);
  }

  // Local time parameters of every usage point that maps to a meter.
  for (const up of usagePoints) {
    if (![...meters.values()].some((m) => m.usagePointKey === up.key)) continue;
    const ltpHref = related(up.entry).find((h) => ltps.some((l) => l.href === h));
    const ltp = ltpHref ? ltps.find((l) => l.href === ltpHref) : ltps.length === 1 ? ltps[0] : undefined;
    if (ltp) checkLtp(ltp.node, firstYear.get(up) ?? 2024);
  }

  return { meters: [...meters.values()], meterOfEntry, bills, issues, entries: entries.length, readings: 0 };
}
