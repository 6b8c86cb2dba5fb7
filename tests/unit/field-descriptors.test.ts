// The field descriptors (shared/schema/fields.ts) and the zod schemas describe the same fields: every
// field of every discharge kind and every snubber kind has exactly one descriptor, and every descriptor
// names a field its schema has, whose validation messages use the descriptor's name. Checked against
// the schemas themselves (the wire format, docs/ARCHITECTURE.md §6.3), so the two cannot drift apart.
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { designDraftSchema, designSchema, requirementSchema } from '../../shared/schema/discharge';
import {
  ACTIVE_FIELD_LIST,
  ACTIVE_FIELDS,
  DESIGN_GROUPS,
  nounOf,
  REQUIREMENT_FIELDS,
  SNUBBER_FIELDS,
  SNUBBER_KIND_KEYS,
  SNUBBER_OTHER_FIELDS,
  snubberFieldsOf,
  type ActiveMode,
  type FieldSpec,
} from '../../shared/schema/fields';
import { rcdClampSnubberSchema, rcdTurnoffSnubberSchema, rcSnubberSchema, snubberDraftSchema } from '../../shared/schema/snubber';

type Schema = z.ZodType;

/** Optional, nullable and defaulted wrappers peeled off: the field's own schema. */
function core(schema: Schema): Schema {
  const def = schema.def as { type: string; innerType?: Schema };
  return ['optional', 'nullable', 'default'].includes(def.type) && def.innerType ? core(def.innerType) : schema;
}

const shapeOf = (schema: Schema): Record<string, Schema> => (core(schema) as z.ZodObject).shape;

/** The number fields of an object schema, as "prefix.key" paths. */
const numberPaths = (schema: Schema, prefix = '', skip: readonly string[] = []) =>
  Object.entries(shapeOf(schema))
    .filter(([key, field]) => !skip.includes(key) && core(field).def.type === 'number')
    .map(([key]) => (prefix ? `${prefix}.${key}` : key));

/** The one option of a discriminated union whose discriminator is `value`. */
function optionOf(union: Schema, key: string, value: string): Schema {
  const options = (core(union) as z.ZodDiscriminatedUnion<z.ZodObject[]>).options;
  const found = options.find((o) => (o.shape[key] as z.ZodLiteral).def.values.includes(value));
  if (!found) throw new Error(`no ${key} = ${value} in the union`);
  return found;
}

const paths = (fields: readonly FieldSpec[]) => fields.map((f) => f.path).sort();
const sorted = (list: readonly string[]) => [...list].sort();
const MODES: ActiveMode[] = ['constant-current', 'switched-resistor'];
const PASSIVE_GROUPS = ['bus', 'capacitors', 'bleeder', 'ambient', 'balancing'];

describe('design field descriptors', () => {
  it('the design has exactly the groups the descriptors know, besides the active circuit and the snubbers', () => {
    expect(sorted(Object.keys(designSchema.shape))).toEqual(sorted([...DESIGN_GROUPS.map((g) => g.key), 'active', 'snubbers']));
    expect(sorted(DESIGN_GROUPS.map((g) => g.key))).toEqual(sorted(PASSIVE_GROUPS));
  });

  it('every number field of the passive network has one descriptor, and every descriptor is such a field', () => {
    for (const group of DESIGN_GROUPS) {
      const schemaPaths = numberPaths(designSchema.shape[group.key as keyof typeof designSchema.shape], group.key);
      expect(paths(group.fields), group.key).toEqual(sorted(schemaPaths));
      expect(Object.keys(shapeOf(designSchema.shape[group.key as keyof typeof designSchema.shape])).length, `${group.key}: only numbers`).toBe(
        schemaPaths.length,
      );
    }
  });

  for (const mode of MODES) {
    it(`the ${mode} circuit: each of its fields has one descriptor, each descriptor of that mode is one of its fields`, () => {
      const option = optionOf(designSchema.shape.active, 'mode', mode);
      expect(paths(ACTIVE_FIELDS[mode])).toEqual(sorted(numberPaths(option, 'active', ['mode'])));
      expect(sorted(Object.keys(shapeOf(option)))).toEqual(sorted(['mode', ...ACTIVE_FIELDS[mode].map((f) => f.path.slice('active.'.length))]));
      // The draft schema of the mode has the same fields.
      expect(sorted(Object.keys(shapeOf(optionOf(designDraftSchema.shape.active, 'mode', mode))))).toEqual(sorted(Object.keys(shapeOf(option))));
    });
  }

  it('no path is described twice (a field shared by both modes is one descriptor listing both)', () => {
    const all = [...DESIGN_GROUPS.flatMap((g) => g.fields), ...ACTIVE_FIELD_LIST].map((f) => f.path);
    expect(new Set(all).size).toBe(all.length);
    for (const spec of ACTIVE_FIELD_LIST) expect(spec.modes.length, spec.path).toBeGreaterThan(0);
  });

  it('every requirement number field has one descriptor, and every descriptor is one', () => {
    expect(paths(REQUIREMENT_FIELDS)).toEqual(sorted(numberPaths(requirementSchema)));
  });

  it('a validation message names the field as its descriptor does', () => {
    const wrong = 'not a number';
    const nested = (path: string): Record<string, unknown> => {
      const [group, key] = path.split('.');
      return { [group]: group === 'active' ? { mode: ACTIVE_FIELD_LIST.find((f) => f.path === path)!.modes[0], [key]: wrong } : { [key]: wrong } };
    };
    for (const spec of [...DESIGN_GROUPS.flatMap((g) => g.fields), ...ACTIVE_FIELD_LIST]) {
      const result = designDraftSchema.safeParse(nested(spec.path));
      const issue = result.error?.issues.find((i) => i.path.join('.') === spec.path);
      expect(issue?.message, spec.path).toMatch(new RegExp(`^${escape(nounOf(spec))} `));
    }
    for (const spec of REQUIREMENT_FIELDS) {
      const issue = requirementSchema.safeParse({ [spec.path]: wrong }).error?.issues.find((i) => i.path.join('.') === spec.path);
      expect(issue?.message, spec.path).toMatch(new RegExp(`^${escape(nounOf(spec))} `));
    }
  });
});

const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

describe('snubber field descriptors', () => {
  const schemas = { rc: rcSnubberSchema, 'rcd-turnoff': rcdTurnoffSnubberSchema, 'rcd-clamp': rcdClampSnubberSchema } as const;
  const others = Object.keys(SNUBBER_OTHER_FIELDS);

  it('the kinds the descriptors know are the kinds the schema accepts', () => {
    const kinds = (snubberDraftSchema.options as z.ZodObject[]).map((o) => (o.shape.kind as z.ZodLiteral).def.values[0]);
    expect(sorted(kinds as string[])).toEqual(sorted(SNUBBER_KIND_KEYS));
  });

  for (const kind of SNUBBER_KIND_KEYS) {
    it(`${kind}: every field has exactly one descriptor, every descriptor of the kind is one of its fields`, () => {
      const shape = shapeOf(schemas[kind]);
      const numeric = numberPaths(schemas[kind]);
      const described = snubberFieldsOf(kind).map((f) => f.key);
      expect(new Set(described).size).toBe(described.length);
      expect(sorted(described)).toEqual(sorted(numeric));
      expect(sorted(Object.keys(shape))).toEqual(sorted([...numeric, ...others]));
      expect(sorted(Object.keys(shapeOf(optionOf(snubberDraftSchema, 'kind', kind))))).toEqual(sorted(Object.keys(shape)));
    });

    it(`${kind}: a validation message names the field as its descriptor does`, () => {
      for (const spec of snubberFieldsOf(kind)) {
        const issue = optionOf(snubberDraftSchema, 'kind', kind)
          .safeParse({ kind, [spec.key]: 'not a number' })
          .error?.issues.find((i) => i.path.join('.') === spec.key);
        expect(issue?.message, spec.key).toMatch(new RegExp(`^${escape(nounOf(spec))} `));
      }
    });
  }

  it('every descriptor belongs to at least one kind and is named once', () => {
    const keys = SNUBBER_FIELDS.map((f) => f.key);
    expect(new Set(keys).size).toBe(keys.length);
    for (const spec of SNUBBER_FIELDS) expect(spec.kinds.length, spec.key).toBeGreaterThan(0);
  });
});
