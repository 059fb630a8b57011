/** One tenant page per building with `tenant_page: yes` (pagination alias `t`); the layout reads `pageModel`. */
export default {
  pagination: { data: "site.tenants", size: 1, alias: "t", addAllPagesToCollections: false },
  permalink: (data) => data.t.path,
  eleventyComputed: { pageModel: (data) => data.t },
};
