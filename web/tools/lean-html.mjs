// The page without its comments and the indents of its lines, for the served build
// (tools/minify.mjs) and the single file (tools/single.mjs). The page has no <pre>, no inline
// script or style, and its text areas start empty, so nothing shown changes; a line break
// stays where a space may matter. Refuses a page where that no longer holds.
export function leanHtml(html) {
  if (/<pre|<script(?![^>]*\bsrc=)|<style|<textarea[^>]*>[^<]/.test(html)) {
    throw new Error('index.html has text whose spaces count: its indents cannot be stripped');
  }
  return html.replace(/<!--[\s\S]*?-->\n?/g, '').replace(/^[ \t]+/gm, '');
}
