/** Escapes text for HTML element content and quoted attribute values. Every user string passes here. */
function escapeHtml(text: unknown): string {
  return String(text)
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

/** A tagged template that escapes every interpolated value unless it is marked as HTML by `raw`. */
export class Html {
  constructor(readonly text: string) {}
  toString(): string {
    return this.text;
  }
}

export function raw(text: string): Html {
  return new Html(text);
}

export function html(strings: TemplateStringsArray, ...values: unknown[]): Html {
  let out = strings[0];
  values.forEach((v, i) => {
    out += render(v) + strings[i + 1];
  });
  return new Html(out);
}

function render(v: unknown): string {
  if (v instanceof Html) return v.text;
  if (Array.isArray(v)) return v.map(render).join('');
  if (v === undefined || v === null || v === false) return '';
  return escapeHtml(v);
}
