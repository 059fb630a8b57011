/** The layout reads `pageModel`; for this template it is the dispute list's view model. */
export default { eleventyComputed: { pageModel: (data) => data.site.disputes } };
