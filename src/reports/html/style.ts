/** The report's stylesheet: inline, no web fonts, readable on screen and on paper. */
export const REPORT_CSS = `
:root { --ink:#1d2330; --muted:#5b6270; --line:#d7dae0; --soft:#f4f5f7; --ok:#0b6e4f; --warn:#a15c07; --bad:#a61b1b; --accent:#3a5a98; }
* { box-sizing: border-box; }
html { font-family: Helvetica, Arial, sans-serif; color: var(--ink); background: #fff; font-size: 15px; line-height: 1.45; }
body { margin: 0 auto; max-width: 980px; padding: 24px 28px 48px; }
header.top { border-bottom: 3px solid var(--ink); padding-bottom: 12px; margin-bottom: 16px; }
header.top h1 { font-size: 1.7rem; margin: 0 0 4px; }
header.top .meta { color: var(--muted); font-size: 0.9rem; }
.status { display: inline-block; padding: 2px 10px; border-radius: 3px; font-weight: bold; color: #fff; font-size: 0.85rem; letter-spacing: 0.03em; text-transform: uppercase; vertical-align: middle; }
.status.converged { background: var(--ok); } .status.stopped { background: var(--warn); } .status.failed { background: var(--bad); }
.message { margin: 8px 0 0; }
.description { margin: 6px 0 0; color: var(--muted); }
h2 { font-size: 1.25rem; margin: 32px 0 10px; padding-bottom: 4px; border-bottom: 1px solid var(--line); }
h3 { font-size: 1.08rem; margin: 24px 0 8px; }
h4 { font-size: 0.98rem; margin: 18px 0 6px; }
.cautions { border-left: 4px solid var(--warn); background: #fdf6ec; padding: 8px 14px; margin: 12px 0; font-size: 0.92rem; }
.cautions ul { margin: 4px 0; padding-left: 20px; }
nav.toc { font-size: 0.9rem; color: var(--muted); }
nav.toc a { color: var(--accent); margin-right: 14px; text-decoration: none; }
table { border-collapse: collapse; width: 100%; font-size: 0.88rem; margin: 6px 0 10px; }
th, td { text-align: left; padding: 4px 8px; border-bottom: 1px solid var(--line); vertical-align: top; }
th { background: var(--soft); font-weight: bold; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr.fixed td { color: var(--muted); }
.flag { color: var(--bad); font-weight: bold; }
.note { color: var(--muted); font-size: 0.88rem; }
ul.problems li { margin-bottom: 4px; }
.verdict { margin: 6px 0 4px; padding: 6px 10px; border-radius: 3px; font-weight: bold; font-size: 0.92rem; }
.verdict.white { background: #e7f3ee; color: var(--ok); }
.verdict.correlated { background: #fbeee0; color: var(--warn); }
.verdict.unknown { background: var(--soft); color: var(--muted); }
figure { margin: 8px 0; }
figure svg { max-width: 100%; height: auto; display: block; }
.output-block { border: 1px solid var(--line); border-radius: 4px; padding: 8px 14px 10px; margin: 12px 0 18px; break-inside: avoid-page; }
.scores { font-size: 0.88rem; color: var(--muted); }
section.validation h2 { border-bottom-color: var(--accent); }
.validation-intro { font-size: 0.92rem; color: var(--muted); }
dl.provenance { display: grid; grid-template-columns: max-content 1fr; gap: 2px 14px; font-size: 0.88rem; }
dl.provenance dt { font-weight: bold; }
dl.provenance dd { margin: 0; overflow-wrap: anywhere; }
code, .hash { font-family: "DejaVu Sans Mono", Consolas, monospace; font-size: 0.82rem; overflow-wrap: anywhere; }
footer { margin-top: 36px; color: var(--muted); font-size: 0.8rem; border-top: 1px solid var(--line); padding-top: 8px; }
@media print {
  body { max-width: none; padding: 0; font-size: 12px; }
  nav.toc { display: none; }
  h2 { break-after: avoid; }
  .output-block { border-color: #bbb; }
}
`;
