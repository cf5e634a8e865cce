/** The README's setup-file reference, derived from the parameter declarations. */
import { describeExpected, type Decl } from './declare.js';
import { headsetDecl, screenDecl, sectionDecls } from './params.js';

function rows(prefix: string, fields: Record<string, Decl>, out: string[]): void {
  for (const [key, decl] of Object.entries(fields)) {
    const path = `${prefix}.${key}`;
    if (decl.type === 'object') {
      rows(path, decl.fields, out);
      continue;
    }
    const fallback = 'default' in decl && decl.default !== undefined ? `\`${JSON.stringify(decl.default)}\`` : '';
    const source = decl.source ? ` Source: ${decl.source}.` : '';
    out.push(`| \`${path}\` | ${describeExpected(decl)} | ${fallback} | ${decl.doc}${source} |`);
  }
}

export function setupReferenceMarkdown(): string {
  const out = ['| key | allowed | default | meaning |', '|---|---|---|---|'];
  out.push('| `display.preset` | a display preset name | `"desktop-27in"` when display is omitted | Start from a preset; other display keys override it. |');
  out.push('| `display.kind` | `"screen"` or `"headset"` | | Which of the two groups below applies. |');
  rows('display', screenDecl.fields, out);
  rows('display', Object.fromEntries(Object.entries(headsetDecl.fields).filter(([k]) => !(k in screenDecl.fields))), out);
  out.push('| `viewer.preset` | a viewer preset name | `"age-25"` when viewer is omitted | Start from a preset; other viewer keys override it. |');
  for (const [section, decl] of Object.entries(sectionDecls)) {
    rows(section, decl.fields, out);
    if (section === 'percept') out.push('| `percept.referenceViewer` | a viewer preset name or a viewer object (as `viewer`) | `"age-25"` | The viewer who looks at a same-display percept on the display; the percept carries the simulated viewer\'s loss relative to this viewer\'s own. |');
  }
  return out.join('\n');
}
