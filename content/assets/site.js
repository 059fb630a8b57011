// Progressive enhancement for every page; the pages are complete without it.
import { enhanceCharts } from "./charts.js";
import { makeTablesSortable } from "./sortable.js";

makeTablesSortable(document);
enhanceCharts(document);
