/** Every chart model of a site (index, buildings, meters, tenants), for tests that check all chart kinds. */
import type { ChartModel, SiteModel } from "../../src/report/siteModel.ts";

export function everyChart(model: SiteModel): ChartModel[] {
  return [
    ...model.index.charts,
    ...(model.index.intensityChart ? [model.index.intensityChart] : []),
    ...model.buildings.flatMap((b) => [...b.commodities.flatMap((c) => c.charts), ...(b.forecast?.chart ? [b.forecast.chart] : [])]),
    ...model.meterBills.flatMap((m) => [...(m.baseline?.charts ?? []), ...(m.quality?.charts ?? [])]),
    ...model.tenants.flatMap((t) => t.commodities.flatMap((c) => (c.chart ? [c.chart] : []))),
  ];
}
