/** The generated parts of the README and the schema file, from the declarations. */
import { setupJsonSchema } from './schema.js';
import { displayPresets, viewerPresets } from './presets.js';
import { setupReferenceMarkdown } from './reference-table.js';

function replaceBetween(text: string, name: string, body: string): string {
  const start = text.indexOf(`<!-- ${name}:start`);
  const end = text.indexOf(`<!-- ${name}:end -->`);
  if (start < 0 || end < 0) throw new Error(`README has no ${name} markers`);
  const startEnd = text.indexOf('-->', start) + 3;
  return `${text.slice(0, startEnd)}\n${body}\n${text.slice(end)}`;
}

export function presetsMarkdown(): string {
  const table = (title: string, list: typeof displayPresets): string[] => [
    `| ${title} | what | where the numbers come from |`, '|---|---|---|',
    ...list.map((p) => `| \`${p.name}\` | ${p.summary} | ${p.basis} |`),
  ];
  return [...table('display (`--setup`)', displayPresets), '', ...table('viewer (`--viewer`)', viewerPresets)].join('\n');
}

export function generatedDocs(readme: string): { readme: string; schema: string } {
  let out = replaceBetween(readme, 'setup-reference', setupReferenceMarkdown());
  out = replaceBetween(out, 'presets', presetsMarkdown());
  return { readme: out, schema: `${JSON.stringify(setupJsonSchema(), null, 2)}\n` };
}
