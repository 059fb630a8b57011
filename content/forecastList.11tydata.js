/** The layout reads `pageModel`; for this template it is the view model of next year's cost of every building. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.forecastList,
    // the tenant site (--audience tenants) carries no internal page
    permalink: (data) => (data.site.meta.audience === "tenants" ? false : "forecast.html"),
  },
};
