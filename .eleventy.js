/**
 * Eleventy configuration shared by every ohmbook build. The site is built through
 * src/site/writeSite.ts, which adds the view model as global data (`site`), the asset
 * passthrough and the Vite plugin; this file holds only what does not depend on a build.
 */
export default function (eleventyConfig) {
  // Nunjucks escapes by default; set it explicitly because every building name, meter id and
  // message is user text (a name like <script>…</script> must appear as text).
  eleventyConfig.setNunjucksEnvironmentOptions({ autoescape: true });
  return {
    // Input and output folders are given by writeSite (absolute paths), so builds work from any cwd.
    dir: { includes: "_includes" },
    templateFormats: ["njk"],
    htmlTemplateEngine: "njk",
  };
}
