/** The layout reads `pageModel`; for this template it is the methods view model. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.methods,
    // the tenant site (--audience tenants) carries no internal page
    permalink: (data) => (data.site.meta.audience === "tenants" ? false : "methods.html"),
  },
};
