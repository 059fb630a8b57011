/** The layout reads `pageModel`; for this template it is the data page view model. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.data,
    // the tenant site (--audience tenants) carries no internal page
    permalink: (data) => (data.site.meta.audience === "tenants" ? false : "data.html"),
  },
};
