/** One bills page per meter (pagination alias `mb`); the layout reads `pageModel`. */
export default {
  pagination: { data: "site.meterBills", size: 1, alias: "mb", addAllPagesToCollections: false },
  permalink: (data) => data.mb.path,
  eleventyComputed: { pageModel: (data) => data.mb },
};
