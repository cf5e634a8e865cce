/**
 * The small vocabulary in which every setup parameter is declared once: name with unit, range,
 * default, documentation and source. Validation, the JSON Schema and the README table are all
 * derived from these declarations.
 */

export interface NumberDecl {
  type: 'number';
  doc: string;
  /** Unit for people, e.g. `mm`, `cd/m²`; the key name carries it too. */
  unit: string;
  minimum: number;
  maximum: number;
  integer?: boolean;
  default?: number;
  /** Word literals accepted instead of a number, e.g. `auto`. */
  words?: readonly string[];
  source?: string;
}

export interface EnumDecl {
  type: 'enum';
  doc: string;
  values: readonly string[];
  default?: string;
  source?: string;
}

export interface TupleDecl {
  type: 'tuple';
  doc: string;
  /** Names of the items, for messages (e.g. `width`, `height`). */
  names: readonly string[];
  item: Omit<NumberDecl, 'doc' | 'default'>;
  default?: readonly number[];
  source?: string;
}

/** A list of numbers of variable length. */
export interface ListDecl {
  type: 'list';
  doc: string;
  item: Omit<NumberDecl, 'doc' | 'default'>;
  maxItems: number;
  source?: string;
}

export interface ObjectDecl {
  type: 'object';
  doc: string;
  fields: Record<string, Decl>;
}

export type Decl = NumberDecl | EnumDecl | TupleDecl | ListDecl | ObjectDecl;

export function describeExpected(decl: Decl): string {
  switch (decl.type) {
    case 'number': {
      const range = `${decl.integer ? 'a whole number' : 'a number'} from ${decl.minimum} to ${decl.maximum}${decl.unit ? ` ${decl.unit}` : ''}`;
      return decl.words ? `${range} or ${decl.words.map((w) => `"${w}"`).join(' or ')}` : range;
    }
    case 'enum':
      return `one of ${decl.values.map((v) => `"${v}"`).join(', ')}`;
    case 'tuple':
      return `[${decl.names.join(', ')}], each ${describeExpected({ ...decl.item, doc: '' })}`;
    case 'list':
      return `a list of up to ${decl.maxItems} numbers, each ${describeExpected({ ...decl.item, doc: '' })}`;
    case 'object':
      return 'an object';
  }
}
