/** The layout reads `pageModel`; for this template it is the view model of the list of every building. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.buildingList,
    // the tenant site (--audience tenants) carries no internal page
    permalink: (data) => (data.site.meta.audience === "tenants" ? false : "buildings.html"),
  },
};
