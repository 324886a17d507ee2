/** HTML building blocks of the report: escaping, tables and the self-contained page shell. */
import { PALETTE } from './palette.js';

/** Escapes text for HTML content and attribute values (&, <, >, ", '). */
export const escapeHtml = (text: string): string =>
  text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** A table of text cells, all escaped; columns listed in `numeric` are right-aligned. */
export function htmlTable(header: readonly string[], rows: readonly (readonly string[])[], numeric: readonly number[] = []): string {
  const cls = (c: number): string => (numeric.includes(c) ? ' class="num"' : '');
  const head = header.map((h, c) => `<th${cls(c)}>${escapeHtml(h)}</th>`).join('');
  const body = rows.map((r) => `<tr>${r.map((cell, c) => `<td${cls(c)}>${escapeHtml(cell)}</td>`).join('')}</tr>`).join('\n');
  return `<table>\n<thead><tr>${head}</tr></thead>\n<tbody>\n${body}\n</tbody>\n</table>`;
}

/** One report section: a heading, an optional escaped lead paragraph and trusted inner HTML. */
export interface Section {
  readonly id: string;
  readonly title: string;
  readonly lead?: string;
  /** HTML built by this module's helpers or an SVG from the renderer: already safe. */
  readonly html: string;
}

export const sectionHtml = (s: Section): string =>
  `<section id="${escapeHtml(s.id)}">\n<h2>${escapeHtml(s.title)}</h2>\n${s.lead ? `<p class="lead">${escapeHtml(s.lead)}</p>\n` : ''}${s.html}\n</section>`;

/** A plot figure: the SVG inline with an escaped caption. */
export const figureHtml = (svg: string, caption: string): string =>
  `<figure class="plot">${svg}<figcaption>${escapeHtml(caption)}</figcaption></figure>`;

const CSS = `
body { font-family: "DejaVu Sans", Helvetica, Arial, sans-serif; color: ${PALETTE.ink}; margin: 2rem auto; max-width: 1100px; padding: 0 1.5rem; line-height: 1.4; }
header { border-bottom: 3px solid ${PALETTE.indigo}; margin-bottom: 1.5rem; }
h1 { font-size: 1.6rem; margin: 0 0 .3rem; }
h2 { font-size: 1.2rem; margin-top: 2rem; border-bottom: 1px solid #ddd; padding-bottom: .2rem; }
.meta { font-size: .9rem; color: #555; margin: .2rem 0 .8rem; }
.lead { font-size: .92rem; color: #444; }
.status { display: inline-block; padding: .1rem .5rem; border-radius: 3px; font-size: .85rem; font-weight: bold; }
.status.ok { background: #e3eef9; color: ${PALETTE.indigo}; }
.status.fail { background: #fbe3ee; color: #8a1e50; }
table { border-collapse: collapse; font-size: .88rem; margin: .6rem 0 1rem; }
th, td { padding: .25rem .6rem; border-bottom: 1px solid #e2e2e2; text-align: left; vertical-align: top; }
th { background: #f3f3f3; font-weight: 600; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
figure.plot { margin: .8rem 0 1.2rem; }
figure.plot svg { max-width: 100%; height: auto; display: block; }
figcaption { font-size: .85rem; color: #555; margin-top: .3rem; }
footer { margin-top: 3rem; font-size: .8rem; color: #777; border-top: 1px solid #ddd; padding-top: .5rem; }
`;

/** The whole page: inline CSS, no scripts, no external resources. */
export function pageHtml(args: { readonly title: string; readonly meta: readonly string[]; readonly status: { readonly ok: boolean; readonly text: string }; readonly sections: readonly Section[]; readonly footer: string }): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">
<title>${escapeHtml(args.title)}</title>
<style>${CSS}</style>
</head>
<body>
<header>
<h1>${escapeHtml(args.title)}</h1>
${args.meta.map((m) => `<p class="meta">${escapeHtml(m)}</p>`).join('\n')}
<p><span class="status ${args.status.ok ? 'ok' : 'fail'}">${escapeHtml(args.status.text)}</span></p>
</header>
${args.sections.map(sectionHtml).join('\n')}
<footer>${escapeHtml(args.footer)}</footer>
</body>
</html>
`;
}
