/** Assembles the whole site's view model from pipeline results. Pure: no I/O, no clock. */
import type { ReportInput } from "./input.ts";
import type { SiteModel } from "./siteModel.ts";
import { buildBuildingPage, type BuildingContext } from "./buildingPage.ts";
import { buildIndexPage, portfolioLists } from "./indexPage.ts";
import { buildBuildingListPage, buildForecastListPage } from "./listPages.ts";
import { buildMethodsPage } from "./methodsPage.ts";
import { buildDataPage } from "./dataPage.ts";
import { last12MonthsText } from "./periods.ts";
import { effectiveAsOf } from "./usageSummary.ts";
import { formatDate } from "./format.ts";
import { canonicalFor } from "./nav.ts";
import { buildTenantPage } from "./tenantPage.ts";
import { buildDisputesPage } from "./disputesPage.ts";
import { buildClaimSheets } from "./claimSheet.ts";
import { billLinesByBill, buildMeterBillsPage, meterAnalysis } from "./meterBillsPage.ts";
import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF } from "../core/units.ts";
import { groupBy } from "../core/groupBy.ts";
import { buildingSlice, sliceSource, type BuildingSlice } from "./buildingSlice.ts";

/**
 * Turns pipeline results into the view models of every page: index, one page per building
 * (in buildings.csv order), one bills page per meter, methods, data, the dispute list, one
 * claim sheet per dispute, and the lists of every building (buildings.html, forecast.html). Does not mutate its input.
 * @example buildSiteModel(input).buildings.map((b) => b.path) // ["buildings/B1.html", ...]
 */
export function buildSiteModel(input: ReportInput): SiteModel {
  const parts = siteModelInParts(input);
  const { buildings, meterBills, tenants } = parts.pagesOf(0, parts.buildingCount);
  return { ...parts.shell, buildings, meterBills, tenants };
}

/** The site model with its per-building pages made on demand (siteModelInParts). */
export interface SiteModelInParts {
  /** Every page but the per-building ones (`buildings`, `meterBills` and `tenants` are empty). */
  shell: SiteModel;
  buildingCount: number;
  /**
   * The building pages, meter pages and tenant pages of buildings `from` to `to` (exclusive),
   * in buildings.csv order: concatenated over consecutive ranges they equal buildSiteModel's.
   */
  pagesOf(from: number, to: number): Pick<SiteModel, "buildings" | "meterBills" | "tenants">;
  /**
   * Everything the pages of building `index` (buildings.csv order) are made from
   * (buildingSlice.ts): equal slices give equal pages. Plain data, for a content hash.
   */
  sliceOf(index: number): BuildingSlice;
  /** The pages of one building made from its slice (what pagesOf gives for that building). */
  pagesOfSlice(slice: BuildingSlice): Pick<SiteModel, "buildings" | "meterBills" | "tenants">;
}

/**
 * The same model as buildSiteModel, with the pages of each building built only when asked for,
 * so a site writer can build, render and drop them a few buildings at a time.
 */
export function siteModelInParts(input: ReportInput): SiteModelInParts {
  const { portfolio } = input;
  const { settings } = portfolio;
  const currency = settings.currency;
  const asOf = effectiveAsOf(portfolio);
  const heat = input.heatContentByMeter;
  const heatContentOf = (m: { meterId: string }): number => heat?.get(m.meterId) ?? DEFAULT_HEAT_CONTENT_THERM_PER_CCF;

  const billsByMeter = groupBy(portfolio.bills, (b) => b.meterId);
  for (const list of billsByMeter.values()) {
    list.sort((a, b) => (a.periodStart < b.periodStart ? -1 : a.periodStart > b.periodStart ? 1 : a.billId < b.billId ? -1 : 1));
  }

  const contexts: BuildingContext[] = portfolio.buildings.map((building) => ({
    building,
    meters: portfolio.meters.filter((m) => m.buildingId === building.buildingId),
    billsByMeter,
    asOf,
    heatContentOf,
    currency,
  }));

  const linesByBill = billLinesByBill(portfolio.billLines);
  const source = sliceSource(input, billsByMeter, linesByBill, asOf);

  const withCanonical = canonicalIn(settings.basePath);

  // Every building's rows, made once: the index shows all or the first of them, the list pages all.
  const lists = portfolioLists(input, contexts, asOf);
  const shell: SiteModel = {
    meta: {
      portfolioName: settings.name,
      currency,
      buildDate: formatDate(input.buildDate),
      buildDateIso: input.buildDate,
      audience: "internal",
      stamp: `${input.buildDateKind === "data" ? "Figures as of" : "Built"} ${formatDate(input.buildDate)}`,
      basePath: settings.basePath,
    },
    index: withCanonical(buildIndexPage(input, contexts, asOf, lists)),
    buildings: [],
    meterBills: [],
    tenants: [],
    methods: withCanonical(buildMethodsPage(currency, last12MonthsText(asOf), settings.tolerances)),
    data: withCanonical(buildDataPage(portfolio.report, input.issues)),
    disputes: withCanonical(buildDisputesPage(input)),
    buildingList: withCanonical(buildBuildingListPage(input, lists.buildings)),
    forecastList: withCanonical(buildForecastListPage(input, lists.forecast)),
    claims: buildClaimSheets(input.disputes, portfolio, formatDate(input.buildDate)).map(withCanonical),
  };
  return {
    shell,
    buildingCount: contexts.length,
    pagesOf(from, to) {
      const pages = contexts.slice(from, to).map((ctx) => pagesOfSlice(buildingSlice(source, ctx.building)));
      return { buildings: pages.flatMap((p) => p.buildings), meterBills: pages.flatMap((p) => p.meterBills), tenants: pages.flatMap((p) => p.tenants) };
    },
    sliceOf: (index) => buildingSlice(source, contexts[index]!.building),
    pagesOfSlice,
  };
}

/**
 * The pages of one building, made from its slice alone (never from the whole input: the slice
 * is their key, buildingSlice.ts). Page links need only the slice's settings.
 */
export function pagesOfSlice(slice: BuildingSlice): Pick<SiteModel, "buildings" | "meterBills" | "tenants"> {
  const { input, building } = slice;
  const { settings } = input.portfolio;
  const heat = input.heatContentByMeter;
  const ctx: BuildingContext = {
    building,
    meters: slice.meters,
    billsByMeter: slice.billsByMeter,
    asOf: slice.asOf,
    heatContentOf: (m) => heat?.get(m.meterId) ?? DEFAULT_HEAT_CONTENT_THERM_PER_CCF,
    currency: settings.currency,
    forecastMethod: slice.forecastMethod,
  };
  const withCanonical = canonicalIn(settings.basePath);
  // Each meter's baseline and quality sections: verdicts on the building page, detail on the meter page.
  const analysis = meterAnalysis(input, ctx);
  return {
    buildings: [withCanonical(buildBuildingPage(input, ctx, analysis))],
    meterBills: ctx.meters.map((m) => withCanonical(buildMeterBillsPage(input, ctx, m, analysis, slice.linesByBill))),
    tenants: building.tenantPage ? [withCanonical(buildTenantPage(building, ctx.meters, slice.billsByMeter, input.baselines, settings.contacts?.[building.buildingId] ?? null))] : [],
  };
}

/**
 * The site for tenants (`--audience tenants`): only the tenant pages and a front page listing
 * them. Every internal page list is emptied, so nothing of the audit, the money or the models is
 * rendered, and the caller writes no data files.
 * @example tenantSiteModel(buildSiteModel(input)).buildings // []
 */
export function tenantSiteModel(model: SiteModel): SiteModel {
  const index = {
    title: `${model.meta.portfolioName}: pages for occupants`,
    root: "",
    path: "index.html",
    canonical: canonicalFor(model.meta.basePath, "index.html"),
    nav: [],
    intro: model.tenants.length > 0 ? "Monthly use of each building, from its meter readings." : "No building of this portfolio publishes a page for its occupants.",
    links: model.tenants.map((t) => ({ name: t.buildingName, href: t.path })),
  };
  return {
    ...model,
    meta: { ...model.meta, audience: "tenants" },
    buildings: [],
    meterBills: [],
    claims: [],
    tenantIndex: index,
  };
}

/** A page model with its canonical address under the site's base path. */
function canonicalIn(basePath: string) {
  return <T extends { path: string }>(page: T): T & { canonical: string } => ({ ...page, canonical: canonicalFor(basePath, page.path) });
}
