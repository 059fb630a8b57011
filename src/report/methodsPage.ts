/**
 * View model of the methods page. The prose lives in the template; numbers, tolerances, the
 * table of audit checks and their sources here, so the page states this portfolio's settings.
 */
import type { Tolerances } from "../domain/types.ts";
import type { CheckGroupModel, LabelValue, MethodsPage, UnitFactorRow } from "./siteModel.ts";
import { formatMoney, formatNumber } from "./format.ts";
import { navFor } from "./nav.ts";
import { checkTitle } from "./labels.ts";
import { basisKey } from "./disputesPage.ts";
import { AUDIT_DEFAULTS } from "../audit/index.ts";
import { COMMON_RATIOS } from "../audit/index.ts";

/** Unit factors the pipeline uses, with where each comes from. */
const UNIT_FACTORS: readonly UnitFactorRow[] = [
  { from: "1 MWh", to: "kWh", factor: "1,000", source: "SI prefix (exact)" },
  { from: "1 kWh", to: "MJ", factor: "3.6", source: "SI definition of the watt-hour (exact)" },
  { from: "1 kWh", to: "Btu", factor: "3,412.14", source: "Btu (International Table) = 1,055.05585262 J, NIST SP 811" },
  { from: "1 therm", to: "kWh", factor: "29.3071", source: "1 therm = 100,000 Btu (U.S. EIA), converted with NIST SP 811" },
  { from: "1 ccf of gas", to: "therm", factor: "1.037 unless the tariff states its own heat content", source: "U.S. EIA average heat content of natural gas, about 1,037 Btu per cubic foot" },
  { from: "1 ccf of water", to: "US gallons", factor: "748.052", source: "1 US gallon = 231 cubic inches (exact), 100 ft³ = 172,800 in³" },
  { from: "1 m³", to: "US gallons", factor: "264.172", source: "1 US gallon = 3.785411784 L (exact), NIST SP 811" },
  { from: "1 ft²", to: "m²", factor: "0.09290304", source: "international foot = 0.3048 m (exact)" },
];

/** One audit check as the methods page explains it. */
interface CheckExplanation {
  code: string;
  looksFor: string;
  rule: string;
  severity: string;
  amount: string;
  source: string;
}

const PORTFOLIO_RULE = "rule of this project (tolerances from portfolio.yaml)";

/**
 * Every audit check code (outputs.md) in plain words, with its rule, severity, money at stake
 * and where the rule comes from. Written from each check module's doc comment in
 * src/audit/checks; `t` fills in this portfolio's tolerances.
 */
export function checkExplanations(t: Tolerances, currency: string): CheckExplanation[] {
  const money = `more than BOTH ${formatMoney(t.costAbs, currency)} and ${formatNumber(t.costPct, 2)} %`;
  const usage = `${formatNumber(t.usagePct, 2)} %`;
  const demand = `${formatNumber(t.demandPct, 2)} %`;
  const coverage = `${formatNumber(AUDIT_DEFAULTS.minCoverage * 100)} %`;
  const streak = formatNumber(AUDIT_DEFAULTS.estimateStreakMin);
  const ratio = formatNumber(AUDIT_DEFAULTS.outlierRatio);
  return [
    {
      code: "total-mismatch",
      looksFor: "The billed total differs from the total the tariff gives for the billed quantities.",
      rule: `Compared only when every recomputed line is exact. A finding when billed − recomputed differs by ${money} of the recomputed total. A bill that could not be priced, or only partly exactly, gets an info note saying what was not compared.`,
      severity: "error (info for “not compared”)",
      amount: "billed − recomputed total",
      source: PORTFOLIO_RULE,
    },
    {
      code: "line-mismatch",
      looksFor: "A printed charge differs from the tariff charge with the same label.",
      rule: `Labels matched ignoring case and spaces; only labels whose recomputed lines are all exact. A finding when printed − recomputed differs by ${money} of the recomputed charge.`,
      severity: "error",
      amount: "printed − recomputed for that line",
      source: PORTFOLIO_RULE,
    },
    {
      code: "unexplained-line",
      looksFor: "A printed charge that no charge of the tariff explains.",
      rule: `A finding when the line's amount is ${money} of the bill total. It may be a legitimate charge missing from the tariff file.`,
      severity: "warning",
      amount: "the line's amount",
      source: PORTFOLIO_RULE,
    },
    {
      code: "usage-vs-meter",
      looksFor: "Billed usage differs from the sum of the meter's interval readings over the bill's exact service period (local time, daylight-saving aware).",
      rule: `Compared only when at least ${coverage} of the period's intervals are present (the sum is scaled up by the coverage when a few are missing); below that, an info note says it was not compared. A finding when |billed − metered| ÷ metered > ${usage}.`,
      severity: `error beyond 5 × ${usage}, else warning`,
      amount: "billed total − total re-priced on the metered usage",
      source: PORTFOLIO_RULE,
    },
    {
      code: "demand-vs-meter",
      looksFor: "Billed maximum demand differs from the highest rolling average of the interval data over the tariff's demand window (15 minutes when it names none).",
      rule: `Compared when at least ${coverage} of intervals are present. A finding when |billed − metered| ÷ metered > ${demand}.`,
      severity: `error when the bill is above the meter's peak by more than 5 × ${demand} (demand the meter never saw), else warning`,
      amount: "billed total − total re-priced with the metered peak",
      source: PORTFOLIO_RULE,
    },
    {
      code: "period-gap",
      looksFor: "Days between two consecutive bills of a meter that no bill covers.",
      rule: "Bills in service order, duplicates left out; the gap runs from the latest end so far to the next start (periods are half-open, so bills that abut leave no gap).",
      severity: "warning",
      amount: "none (usually a bill that arrives later)",
      source: "rule of this project",
    },
    {
      code: "period-overlap",
      looksFor: "A bill whose service period starts before an earlier bill of the same meter has ended.",
      rule: "Exact duplicates are left to duplicate-bill. One finding per overlapping pair.",
      severity: "error (the overlapped days are paid twice)",
      amount: "overlap days ÷ billing days × the later bill's total (prorated by days)",
      source: "rule of this project; proration by days is common practice",
    },
    {
      code: "duplicate-bill",
      looksFor: "The same service period billed twice on one meter.",
      rule: "Same period, or same usage and total with an overlap of at least half the shorter period (a re-sent bill with shifted dates). The later one, by statement date then input line, is the duplicate.",
      severity: "error",
      amount: "the duplicate's total",
      source: "rule of this project",
    },
    {
      code: "estimated-read",
      looksFor: "Bills on estimated meter reads, runs of them, and the true-up bill after them.",
      rule: `A run of ${streak} or more consecutive estimated bills is one warning for the whole run, naming the true-up bill; a lone estimate is info; the first actual read after estimates gets an info note comparing its use per day with the estimates'.`,
      severity: "warning for a run, info otherwise",
      amount: "none (money, if any, comes from a meter comparison it absorbs)",
      source: "rule of this project",
    },
    {
      code: "usage-outlier",
      looksFor: "Usage far from what the weather and the building's own history lead one to expect.",
      rule: `Outside the bill's expected-usage band from the degree-day model (see “The usage band” below). Meters without such a model use an interim rule, labelled as such in each message: use per day against the same bill month a year earlier (or later, in the first year), flagged beyond × ${ratio} or ÷ ${ratio}; × ${formatNumber(AUDIT_DEFAULTS.outlierRatio ** 1.5, 2)} on strongly seasonal meters (90th ÷ 10th percentile of use per day above 1.5).`,
      severity: "warning",
      amount: "none (the use may be real)",
      source: "band: variable-base degree-day method (Fels 1986) and PRESS residuals (Allen 1974); interim rule: rule of thumb of this project",
    },
    {
      code: "multiplier-suspect",
      looksFor: "Billed usage off the meter by an exact common ratio: a wrong meter multiplier or current-transformer ratio.",
      rule: `r = billed ÷ metered usage per bill (with ${coverage} coverage). Suspect when r, relative to the meter's usual ratio, matches one of ${COMMON_RATIOS.join(", ")} or its inverse within max(${usage}, 1 %). Consecutive suspect bills with the same factor are one finding; a meter whose every bill is off by the same factor gets one meter-level warning instead.`,
      severity: "error (warning at meter level)",
      amount: "Σ billed total − total re-priced on usage and demand divided by the factor",
      source: "common practice (usual transformer ratios and unit slips; not exhaustive)",
    },
    {
      code: "missing-bill",
      looksFor: "Interval data shows the meter in use over days that no bill covers.",
      rule: "Between bills: when interval data covers at least half of the uncovered stretch (otherwise period-gap reports it). After the last bill up to the last data (at most the as-of date): when longer than 75 % of the meter's median billing period. A meter with interval data and no bills at all: one warning. Before the first bill: info.",
      severity: "warning (info before the first bill)",
      amount: "none (the metered use is shown as evidence)",
      source: "rule of this project",
    },
    {
      code: "rate-suspect",
      looksFor: "The bill matches another tariff, or another dated version of its own, much better than the one on file: priced on the wrong schedule or an old rate.",
      rule: "Tried only when the bill's own re-pricing is exact and its total differs beyond the money tolerance. An alternative matches when its difference is within the money tolerance, or at most 2 % of the bill's own difference.",
      severity: "error",
      amount: "billed − recomputed under the bill's own tariff",
      source: PORTFOLIO_RULE,
    },
  ];
}

/**
 * The checks grouped by what the reader does about a finding, each group in the order a reader
 * meets them. Every code of outputs.md is in exactly one group.
 */
const CHECK_GROUPS: readonly { id: string; heading: string; intro: string; codes: readonly string[] }[] = [
  {
    id: "checks-claim",
    heading: "Money to raise with the utility",
    intro: "These checks put a figure on a bill that is wrong. When the bill is too high the figure becomes a claim on the dispute list; when it is too low, a budget risk. Confirm against your copy of the bill first.",
    codes: ["total-mismatch", "line-mismatch", "rate-suspect", "duplicate-bill", "period-overlap", "multiplier-suspect", "usage-vs-meter", "demand-vs-meter"],
  },
  {
    id: "checks-ask",
    heading: "Questions to ask before paying",
    intro: "These checks see something missing or unexplained. It may be a mistake, a charge the tariff file lacks, or a bill still to come; a question to the utility settles it.",
    codes: ["unexplained-line", "period-gap", "missing-bill"],
  },
  {
    id: "checks-note",
    heading: "Worth knowing, nothing to claim",
    intro: "These checks say how far a bill can be trusted as a measure of use. They carry no money of their own.",
    codes: ["estimated-read", "usage-outlier"],
  },
];

/** First letter upper case, the rest untouched ("Σ billed …" keeps its Σ). */
function sentenceStart(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** The checks in groups for the template: our name, the code, and the explanation in sentences. */
function checkGroups(t: Tolerances, currency: string): CheckGroupModel[] {
  const byCode = new Map(checkExplanations(t, currency).map((c) => [c.code, c]));
  return CHECK_GROUPS.map((g) => ({
    id: g.id,
    heading: g.heading,
    intro: g.intro,
    checks: g.codes.map((code) => {
      const c = byCode.get(code)!;
      return { code, title: checkTitle(code), looksFor: c.looksFor, rule: c.rule, severity: sentenceStart(c.severity), amount: sentenceStart(c.amount), source: c.source };
    }),
  }));
}

/** This portfolio's audit tolerances, as label/value pairs. */
function toleranceFacts(t: Tolerances, currency: string): LabelValue[] {
  return [
    { label: "Money (cost_abs and cost_pct)", value: `a difference counts when it exceeds both ${formatMoney(t.costAbs, currency)} and ${formatNumber(t.costPct, 2)} % of the expected amount` },
    { label: "Usage (usage_pct)", value: `${formatNumber(t.usagePct, 2)} % of the metered usage` },
    { label: "Demand (demand_pct)", value: `${formatNumber(t.demandPct, 2)} % of the metered peak` },
    { label: "Interval data coverage for meter comparisons", value: `at least ${formatNumber(AUDIT_DEFAULTS.minCoverage * 100)} % of the period's intervals` },
    { label: "Estimated reads", value: `a run of ${formatNumber(AUDIT_DEFAULTS.estimateStreakMin)} or more is a warning` },
  ];
}

/**
 * Builds the methods page model.
 * @example buildMethodsPage("USD", "the 12 months up to …", { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 }).checkGroups.flatMap((g) => g.checks).length // 13
 */
export function buildMethodsPage(currency: string, windowText: string, tolerances: Tolerances): Omit<MethodsPage, "canonical"> {
  return {
    title: "Methods",
    root: "",
    path: "methods.html",
    nav: navFor("methods", ""),
    currency,
    unitFactors: [...UNIT_FACTORS],
    windowText,
    tolerances: toleranceFacts(tolerances, currency),
    checkGroups: checkGroups(tolerances, currency),
    disputeBases: basisKey(),
  };
}
