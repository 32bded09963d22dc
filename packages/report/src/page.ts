/** The HTML shell every page of a report shares: head with the CSP, the top bar, the footer. */
import { escapeHtml as esc } from './escape.ts';
import { CSS } from './css.ts';

/**
 * The page's Content-Security-Policy: nothing may load or connect (`default-src 'none'`), the
 * inline stylesheet is allowed, images only as data: URIs, and no script runs at all: the report
 * has none, so any script that escaped into it would be blocked as well.
 */
export const CONTENT_SECURITY_POLICY =
  "default-src 'none'; style-src 'unsafe-inline'; img-src data:; script-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'";

export interface Shell {
  /** The document title (plain text). */
  title: string;
  /** The top heading (plain text). */
  heading: string;
  /** The line under the heading (HTML). */
  meta: string;
  /** Links above the heading (HTML), e.g. back to the main report. */
  crumbs?: string;
  /** Section links: [anchor, text]. */
  nav: ReadonlyArray<readonly [string, string]>;
  /** The page body (HTML). */
  body: string;
}

/** One self-contained page: inline CSS, no script, a CSP that forbids every fetch. Cost: O(body). */
export function pageShell(s: Shell): string {
  const nav = s.nav.map(([id, label]) => `<a href="#${esc(id)}">${esc(label)}</a>`).join('');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${CONTENT_SECURITY_POLICY}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="codeweir">
<title>${esc(s.title)}</title>
<style>${CSS}</style>
</head>
<body>
<header class="top"><div class="inner">
${s.crumbs ? `<p class="crumbs">${s.crumbs}</p>` : ''}<h1>${esc(s.heading)}</h1>
<p class="meta">${s.meta}</p>
${s.nav.length > 0 ? `<nav class="toc" aria-label="Sections">${nav}</nav>` : ''}
</div></header>
<main>
${s.body}
</main>
<footer>Made by codeweir. This file is self-contained: it loads nothing and runs no script.</footer>
</body>
</html>
`;
}
