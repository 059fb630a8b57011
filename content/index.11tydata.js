/** The layout reads `pageModel`; for this template it is the index view model. */
export default { eleventyComputed: { pageModel: (data) => data.site.index } };
