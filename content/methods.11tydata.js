/** The layout reads `pageModel`; for this template it is the methods view model. */
export default { eleventyComputed: { pageModel: (data) => data.site.methods } };
