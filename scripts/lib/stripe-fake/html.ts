const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' }

/** Escapes text and attribute values; everything the checkout page echoes goes through this. */
export function escapeHtml(value: string | number): string {
  return String(value).replace(/[&<>"']/g, (character) => HTML_ESCAPES[character]!)
}

/** Formats integer minor units with the currency's own number of decimals (2 for EUR, 0 for JPY). */
export function formatMinorUnits(amountMinor: number, currency: string): string {
  const format = new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() })
  return format.format(amountMinor / 10 ** format.resolvedOptions().maximumFractionDigits!)
}

// The page's own plain look: no external assets, system fonts, a visible focus ring on every control.
const STYLE = `
:root { color-scheme: light; --ink: #1f2328; --muted: #57606a; --paper: #f6f4ef; --panel: #ffffff; --line: #c9c3b6;
  --accent: #1d5b4f; --accent-ink: #ffffff; --error: #a1261b; --focus: #b35c00; }
* { box-sizing: border-box; }
body { margin: 0; font: 16px/1.5 system-ui, sans-serif; color: var(--ink); background: var(--paper); }
main { max-width: 34rem; margin: 2rem auto; padding: 0 1rem; }
.notice { margin: 0 0 1rem; padding: .5rem .75rem; border: 1px dashed var(--muted); color: var(--muted); font-size: .9rem; }
.panel { background: var(--panel); border: 1px solid var(--line); padding: 1.25rem 1.5rem; margin-bottom: 1rem; }
h1 { font-size: 1.4rem; margin: 0 0 1rem; }
h2 { font-size: 1.1rem; margin: 0 0 .75rem; }
table { width: 100%; border-collapse: collapse; }
th, td { text-align: left; padding: .35rem 0; border-bottom: 1px solid var(--line); }
td.amount, th.amount { text-align: right; }
tfoot td { font-weight: 700; border-bottom: none; }
label { display: block; font-weight: 600; margin-top: .9rem; }
.hint { display: block; font-weight: 400; color: var(--muted); font-size: .9rem; }
input { width: 100%; font: inherit; padding: .5rem .6rem; border: 1px solid var(--muted); border-radius: 2px; background: #fff; color: var(--ink); }
input[aria-invalid="true"] { border: 2px solid var(--error); }
.field-error { color: var(--error); font-size: .95rem; margin: .25rem 0 0; }
.row { display: flex; gap: 1rem; } .row > div { flex: 1; }
.actions { display: flex; gap: .75rem; flex-wrap: wrap; margin-top: 1.25rem; }
button, .button-link { font: inherit; font-weight: 600; padding: .6rem 1.1rem; border-radius: 2px; cursor: pointer; text-decoration: none; display: inline-block; }
.primary { background: var(--accent); color: var(--accent-ink); border: 2px solid var(--accent); }
.secondary { background: transparent; color: var(--ink); border: 2px solid var(--muted); }
:focus-visible { outline: 3px solid var(--focus); outline-offset: 2px; }
.alert { border-left: 4px solid var(--error); padding: .5rem .75rem; margin-bottom: 1rem; background: #fbeeed; }
.alert ul { margin: .25rem 0 0; padding-left: 1.25rem; } .alert a { color: var(--error); }
details { margin-top: 1rem; } summary { cursor: pointer; font-weight: 600; }
code { font-size: 1rem; }
`

export function htmlDocument(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
<p class="notice">Local test checkout — a stand-in for the card payment page. No real card is charged.</p>
${body}
</main>
</body>
</html>`
}
