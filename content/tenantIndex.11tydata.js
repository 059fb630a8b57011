/** The tenant site's front page (only with --audience tenants): a list of the tenant pages. */
export default {
  eleventyComputed: {
    pageModel: (data) => data.site.tenantIndex,
    permalink: (data) => (data.site.meta.audience === "tenants" && data.site.tenantIndex ? "index.html" : false),
  },
};
