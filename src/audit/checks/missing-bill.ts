/**
 * missing-bill — the meter's interval data covers a stretch that no bill covers.
 *
 * Stretches considered, in the building's local dates:
 *  - between bills (after the latest end so far, before the next start): warning when the
 *    interval data covers at least half of the stretch (otherwise period-gap reports it);
 *  - after the meter's last bill up to the last day of data, capped at as_of (default: the last
 *    bill end in the portfolio): warning when longer than trailingMissingDays (default 75 % of the
 *    meter's median billing period: most of a cycle has passed and no bill covers it);
 *  - before the first bill: info when longer than that (data often predates bills);
 *  - a meter with interval data and no bills at all: one warning.
 * Amount = − the metered use of the stretch priced through the tariff (see unbilled.ts): nothing
 * was overbilled, but the utility may still bill it.
 */
import type { Bill } from "../../domain/types.ts";
import { billsInSequence, buildingOf, type AuditContext } from "../context.ts";
import { minDate } from "../dates.ts";
import { formatPct, formatQty } from "../format.ts";
import { meteredForPeriod } from "../reconcile.ts";
import type { Finding, MeteredPeriod, Severity } from "../types.ts";
import { unbilledCorrection } from "./unbilled.ts";
import { addDays, daysBetween, isValidZone, localDateOf } from "../../core/time/index.ts";
import { moneyText } from "../../core/money.ts";
import { expectedProblem } from "../../core/errors.ts";

const MIN_GAP_COVERAGE = 0.5;

function medianBillingDays(bills: Bill[]): number {
  const d = bills.map((b) => daysBetween(b.periodStart, b.periodEnd)).sort((a, b) => a - b);
  if (d.length === 0) return 30;
  const mid = d.length >> 1;
  return d.length % 2 ? d[mid] : (d[mid - 1] + d[mid]) / 2;
}

/** missing-bill findings for every meter with interval data. */
export function checkMissingBill(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  const p = ctx.input.portfolio;
  const lastBillEnd = p.bills.reduce((m, b) => (b.periodEnd > m ? b.periodEnd : m), "");
  // as_of covers bills with period_end <= as_of + 1 day; default = the last bill end
  const asOfEnd = p.settings.asOf ? addDays(p.settings.asOf, 1) : lastBillEnd || "9999-12-31";
  for (const [meterId, series] of ctx.input.portfolio.intervals) {
    const meter = ctx.meters.get(meterId);
    const zone = meter ? ctx.buildings.get(meter.buildingId)?.timezone : undefined;
    if (!meter || !zone || series.startMs.length === 0) continue;
    let firstIdx = 0;
    while (firstIdx < series.values.length && !Number.isFinite(series.values[firstIdx])) firstIdx++;
    let lastIdx = series.values.length - 1;
    while (lastIdx >= 0 && !Number.isFinite(series.values[lastIdx])) lastIdx--;
    if (firstIdx > lastIdx) continue;
    if (!isValidZone(zone)) continue;
    const dataStart = localDateOf(series.startMs[firstIdx], zone);
    let dataEnd = addDays(localDateOf(series.startMs[lastIdx], zone), 1);
    dataEnd = minDate(dataEnd, asOfEnd);
    const unit = meter.unit;

    const stretch = (from: string, to: string, severity: Severity, why: string, related: Bill[]): void => {
      if (to <= from) return;
      let m: MeteredPeriod;
      try {
        m = meteredForPeriod(series, meter.multiplier, from, to, zone, 15, null);
      } catch (error) {
        expectedProblem(error);
        return; // unresolvable zone or date: ingest reports it
      }
      if (m.coverage < MIN_GAP_COVERAGE) return;
      const days = daysBetween(from, to);
      const usage = m.coverage < 1 ? m.usage / m.coverage : m.usage;
      const template = related[related.length - 1];
      const worth = template
        ? unbilledCorrection(ctx, template, from, to, { p50: usage, low: usage, high: usage, basis: "the interval data", demandKw: null }, unit)
        : null;
      if (worth) delete worth.range; // metered: no band
      out.push({
        buildingId: buildingOf(ctx, meterId), meterId, billId: null, periodStart: from, periodEnd: to,
        check: "missing-bill", severity, amountAtStake: worth && severity !== "info" ? -worth.correctedTotal : null,
        title: "Metered use with no bill",
        message: `The interval meter recorded ${formatQty(m.usage)} ${unit} over the ${days} day${days === 1 ? "" : "s"} from ${from} to ${to}, but no bill of meter ${meterId} covers them (${why}).${worth ? ` Priced through the tariff that use is worth ${moneyText(worth.correctedTotal, ctx.currency)}.` : ""}`,
        evidence: {
          rows: [{ label: `Usage (${unit})`, billed: null, expected: Number(m.usage.toFixed(3)) }],
          notes: [`Interval coverage of the stretch ${formatPct(m.coverage)}.`],
        },
        relatedBillIds: related.map((b) => b.billId),
        corrections: worth && severity !== "info" ? [worth] : undefined,
      });
    };

    const bills = billsInSequence(ctx, meterId);
    const limitDays = ctx.tol.trailingMissingDays ?? 0.75 * medianBillingDays(bills);
    if (bills.length === 0) {
      stretch(dataStart, dataEnd, "warning", "the meter has no bills at all", []);
      continue;
    }
    if (daysBetween(dataStart, bills[0].periodStart) > limitDays) {
      stretch(dataStart, bills[0].periodStart, "info", "interval data starts before the first bill", [bills[0]]);
    }
    let latest = bills[0];
    for (const bill of bills.slice(1)) {
      if (bill.periodStart > latest.periodEnd) {
        stretch(latest.periodEnd, bill.periodStart, "warning", `between bills ${latest.billId} and ${bill.billId}`, [latest, bill]);
      }
      if (bill.periodEnd > latest.periodEnd) latest = bill;
    }
    if (daysBetween(latest.periodEnd, dataEnd) > limitDays) {
      stretch(latest.periodEnd, dataEnd, "warning", `after the last bill ${latest.billId}, longer than ${formatQty(limitDays, 1)} days`, [latest]);
    }
  }
  return out;
}
