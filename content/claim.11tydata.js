/** One printable claim sheet per dispute (pagination alias `c`); the layout reads `pageModel`. */
export default {
  pagination: { data: "site.claims", size: 1, alias: "c", addAllPagesToCollections: false },
  permalink: (data) => data.c.path,
  eleventyComputed: { pageModel: (data) => data.c },
};
