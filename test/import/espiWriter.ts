/**
 * Writes small ESPI (Green Button) Atom feeds for round-trip tests: one usage point, one
 * reading type, interval blocks and usage summaries, with the quirks real producers emit
 * (whitespace inside values, comments inside elements, `espi:` prefixes) when asked.
 */
export interface SyntheticReading {
  start: number;
  duration?: number;
  value: string;
  quality?: number;
}

export interface SyntheticFeed {
  kind?: number;
  uom?: number;
  powerOfTen?: number;
  intervalLength?: number;
  tzOffset?: number;
  dstOffset?: number;
  blocks: { start: number; duration: number; readings: SyntheticReading[] }[];
  summaries?: { start: number; duration: number; bill?: string; usage?: string; usageUom?: number; usagePow?: number; currency?: number; quality?: number; lines?: { note: string; amount: string }[] }[];
  /** Quirks: spaces around values, comments inside elements, `espi:` prefixes. */
  quirks?: boolean;
  /** ReadingType accumulationBehaviour (default 4, deltaData). */
  accumulation?: number;
}

export function writeEspi(feed: SyntheticFeed): string {
  const q = feed.quirks ?? false;
  const v = (x: string | number): string => (q ? `  ${x} ` : String(x));
  const c = q ? "<!-- note -->" : "";
  const p = q ? "espi:" : "";
  const ns = q ? 'xmlns:espi="http://naesb.org/espi"' : 'xmlns="http://naesb.org/espi"';
  const up = "RetailCustomer/1/UsagePoint/7";
  const blocks = feed.blocks
    .map(
      (b) => `<${p}IntervalBlock ${ns}>
  <${p}interval><${p}duration>${v(b.duration)}</${p}duration><${p}start>${v(b.start)}</${p}start>${c}</${p}interval>
${b.readings
  .map(
    (r) => `  <${p}IntervalReading>${r.quality !== undefined ? `<${p}ReadingQuality><${p}quality>${r.quality}</${p}quality></${p}ReadingQuality>` : ""}${r.duration !== undefined ? `<${p}timePeriod><${p}duration>${v(r.duration)}</${p}duration>${c}<${p}start>${v(r.start)}</${p}start></${p}timePeriod>` : ""}<${p}value>${v(r.value)}</${p}value></${p}IntervalReading>`,
  )
  .join("\n")}
</${p}IntervalBlock>`,
    )
    .join("\n");
  const summaries = (feed.summaries ?? [])
    .map(
      (s, i) => `<entry>
  <link rel="self" href="RetailCustomer/1/ElectricPowerUsageSummary/${i + 1}"/>
  <link rel="up" href="${up}/ElectricPowerUsageSummary"/>
  <content><${p}ElectricPowerUsageSummary ${ns}>
    <${p}billingPeriod><${p}duration>${v(s.duration)}</${p}duration><${p}start>${v(s.start)}</${p}start></${p}billingPeriod>
    ${s.bill !== undefined ? `<${p}billLastPeriod>${v(s.bill)}</${p}billLastPeriod>` : ""}
    ${(s.lines ?? []).map((l) => `<${p}costAdditionalDetailLastPeriod><${p}amount>${l.amount}</${p}amount><${p}note>${l.note}</${p}note></${p}costAdditionalDetailLastPeriod>`).join("")}
    <${p}currency>${s.currency ?? 840}</${p}currency>
    ${s.usage !== undefined ? `<${p}overallConsumptionLastPeriod><${p}powerOfTenMultiplier>${s.usagePow ?? 0}</${p}powerOfTenMultiplier><${p}uom>${s.usageUom ?? feed.uom ?? 72}</${p}uom><${p}value>${v(s.usage)}</${p}value></${p}overallConsumptionLastPeriod>` : ""}
    ${s.quality !== undefined ? `<${p}qualityOfReading>${s.quality}</${p}qualityOfReading>` : ""}
  </${p}ElectricPowerUsageSummary></content>
</entry>`,
    )
    .join("\n");
  return `<?xml version="1.0" encoding="UTF-8"?>
<feed xmlns="http://www.w3.org/2005/Atom">
<id>urn:uuid:test</id>
<entry>
  <id>urn:uuid:up</id>
  <link rel="self" href="${up}"/>
  <link rel="related" href="${up}/MeterReading"/>
  <link rel="related" href="LocalTimeParameters/1"/>
  <title>Synthetic site</title>
  <content><${p}UsagePoint ${ns}><${p}ServiceCategory><${p}kind>${v(feed.kind ?? 0)}</${p}kind></${p}ServiceCategory></${p}UsagePoint></content>
</entry>
<entry>
  <link rel="self" href="LocalTimeParameters/1"/>
  <content><${p}LocalTimeParameters ${ns}><${p}dstEndRule>B40E2000</${p}dstEndRule><${p}dstOffset>${feed.dstOffset ?? 3600}</${p}dstOffset><${p}dstStartRule>360E2000</${p}dstStartRule><${p}tzOffset>${v(feed.tzOffset ?? -18000)}</${p}tzOffset></${p}LocalTimeParameters></content>
</entry>
<entry>
  <link rel="self" href="${up}/MeterReading/1"/>
  <link rel="up" href="${up}/MeterReading"/>
  <link rel="related" href="ReadingType/3"/>
  <content><${p}MeterReading ${ns}/></content>
</entry>
<entry>
  <link rel="self" href="ReadingType/3"/>
  <content><${p}ReadingType ${ns}>
    <${p}accumulationBehaviour>${feed.accumulation ?? 4}</${p}accumulationBehaviour><${p}flowDirection>1</${p}flowDirection>
    ${feed.intervalLength !== undefined ? `<${p}intervalLength>${feed.intervalLength}</${p}intervalLength>` : ""}
    <${p}powerOfTenMultiplier>${v(feed.powerOfTen ?? 0)}</${p}powerOfTenMultiplier><${p}uom>${v(feed.uom ?? 72)}</${p}uom>
  </${p}ReadingType></content>
</entry>
<entry>
  <link rel="self" href="${up}/MeterReading/1/IntervalBlock/1"/>
  <link rel="up" href="${up}/MeterReading/1/IntervalBlock"/>
  <content>
${blocks}
  </content>
</entry>
${summaries}
</feed>
`;
}
