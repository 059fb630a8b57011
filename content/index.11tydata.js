/** The layout reads `pageModel`; for this template it is the index view model. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.index,
    // the tenant site (--audience tenants) carries no internal page
    permalink: (data) => (data.site.meta.audience === "tenants" ? false : "index.html"),
  },
};
