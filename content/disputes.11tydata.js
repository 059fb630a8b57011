/** The layout reads `pageModel`; for this template it is the dispute list's view model. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.disputes,
    // the tenant site (--audience tenants) carries no internal page
    permalink: (data) => (data.site.meta.audience === "tenants" ? false : "disputes.html"),
  },
};
