/**
 * The start of every rigcal HTML page up to <body>: one content policy (no fetches of any kind, so
 * a page opens offline and can never call out), the shared style sheet, and the title.
 */
import { html, raw, type Html } from './escape-html.js';
import { REPORT_CSS } from './style.js';

const CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:";

export function pageHead(title: string, version: string): Html {
  return html`<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${raw(CSP)}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="rigcal ${version}">
<title>${title}</title>
<style>${raw(REPORT_CSS)}</style>
</head>`;
}
