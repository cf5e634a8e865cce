/** JSON Schema (draft 2020-12) of a setup file, generated from the same declarations as validation. */
import type { Decl, ObjectDecl } from './declare.js';
import { headsetDecl, screenDecl, sectionDecls } from './params.js';
import { displayPresets, viewerPresets } from './presets.js';

type Schema = Record<string, unknown>;

function declToSchema(decl: Decl): Schema {
  switch (decl.type) {
    case 'number': {
      const num: Schema = { type: decl.integer ? 'integer' : 'number', minimum: decl.minimum, maximum: decl.maximum };
      const base: Schema = decl.words ? { anyOf: [num, { enum: [...decl.words] }] } : num;
      return { ...base, description: `${decl.doc}${decl.unit ? ` Unit: ${decl.unit}.` : ''}`, ...(decl.default !== undefined ? { default: decl.default } : {}) };
    }
    case 'enum':
      return { enum: [...decl.values], description: decl.doc, ...(decl.default !== undefined ? { default: decl.default } : {}) };
    case 'tuple': {
      const item = declToSchema({ ...decl.item, doc: decl.names.join(', ') });
      delete item.description;
      return {
        type: 'array', items: item, minItems: decl.names.length, maxItems: decl.names.length,
        description: `${decl.doc} [${decl.names.join(', ')}]${decl.item.unit ? ` in ${decl.item.unit}` : ''}.`,
        ...(decl.default ? { default: [...decl.default] } : {}),
      };
    }
    case 'list': {
      const item = declToSchema({ ...decl.item, doc: '' });
      delete item.description;
      return { type: 'array', items: item, maxItems: decl.maxItems, description: `${decl.doc}${decl.item.unit ? ` Unit: ${decl.item.unit}.` : ''}` };
    }
    case 'object':
      return objectSchema(decl);
  }
}

function objectSchema(decl: ObjectDecl, extra: Record<string, Schema> = {}): Schema {
  const properties: Record<string, Schema> = { ...extra };
  for (const [key, field] of Object.entries(decl.fields)) properties[key] = declToSchema(field);
  return { type: 'object', description: decl.doc, properties, additionalProperties: false };
}

export function setupJsonSchema(): Schema {
  const displayProps: Record<string, Schema> = {
    preset: { enum: displayPresets.map((p) => p.name), description: 'Start from a built-in display; fields given here override it.' },
    kind: { enum: ['screen', 'headset'], description: 'A flat screen, or one eye buffer of a headset.' },
  };
  const screen = objectSchema(screenDecl, displayProps);
  const headset = objectSchema(headsetDecl, displayProps);
  const viewer: Schema = objectSchema(sectionDecls.viewer, {
    preset: { enum: viewerPresets.map((p) => p.name), description: 'Start from a built-in viewer; fields given here override it.' },
  });
  return {
    $schema: 'https://json-schema.org/draft/2020-12/schema',
    $id: 'https://eyeproof.invalid/setup.schema.json',
    title: 'eyeproof setup',
    description: 'How a frame is viewed: the display, the viewer, the light and the gaze.',
    type: 'object',
    additionalProperties: false,
    properties: {
      $schema: { type: 'string' },
      description: { type: 'string' },
      display: {
        description: 'A flat screen or a headset eye buffer. Name a preset, or give kind and its fields.',
        anyOf: [
          { ...screen, properties: { ...(screen.properties as Schema), kind: { const: 'screen' } } },
          { ...headset, properties: { ...(headset.properties as Schema), kind: { const: 'headset' } } },
          { type: 'object', properties: { ...(screen.properties as Schema), ...(headset.properties as Schema) }, required: ['preset'], additionalProperties: false },
        ],
      },
      viewer,
      light: declToSchema(sectionDecls.light),
      gaze: { ...declToSchema(sectionDecls.gaze), required: ['xPx', 'yPx'] },
      frame: declToSchema(sectionDecls.frame),
      percept: objectSchema(sectionDecls.percept, {
        referenceViewer: {
          description: 'The viewer who looks at a same-display percept: a viewer preset name or a viewer object (default "age-25").',
          anyOf: [{ enum: viewerPresets.map((p) => p.name) }, viewer],
        },
      }),
      models: declToSchema(sectionDecls.models),
    },
  };
}
