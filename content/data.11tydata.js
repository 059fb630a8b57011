/** The layout reads `pageModel`; for this template it is the data page view model. */
export default { eleventyComputed: { pageModel: (data) => data.site.data } };
