/** One page per building (pagination alias `b`); the layout reads `pageModel`. */
export default {
  pagination: { data: "site.buildings", size: 1, alias: "b", addAllPagesToCollections: false },
  permalink: (data) => data.b.path,
  eleventyComputed: { pageModel: (data) => data.b },
};
