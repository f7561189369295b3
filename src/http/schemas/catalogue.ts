/**
 * Stored parts catalogues (a company's approved values list). The write form is
 * what callers PUT; the record form adds the stored metadata and each part's
 * value in SI base units as the service read it.
 */
import { Type, type Static } from 'typebox';
import { DOCUMENT_ID_PATTERN_SOURCE } from '../../store/index.ts';
import { ComponentValue, ref } from './common.ts';

export const MAX_CATALOGUE_PARTS = 20_000;

export const CatalogueId = Type.String({
  pattern: DOCUMENT_ID_PATTERN_SOURCE,
  description: 'Catalogue id: a lowercase letter or digit, then up to 63 of [a-z0-9._-]',
});

const partProperties = {
  kind: Type.Union([Type.Literal('resistor'), Type.Literal('capacitor')], { description: 'What the part is; sets the unit of value (ohm or farad)' }),
  value: ref(ComponentValue, 'Nominal value: ohms or farads as a number, or a value string such as "4k7" or "100n"'),
  tolerance: Type.Number({ exclusiveMinimum: 0, exclusiveMaximum: 1, description: 'Tolerance as a fraction (0.01 = 1 %)' }),
  tempcoPpmPerK: Type.Optional(
    Type.Number({ minimum: -100_000, maximum: 100_000, description: 'Temperature coefficient, ppm/K (resistors; capacitors when known explicitly)' }),
  ),
  dielectric: Type.Optional(
    Type.String({
      minLength: 1,
      maxLength: 40,
      description: 'Capacitors only: EIA-198 ceramic code (C0G, X7R, U2J...) or a technology (PP, PET, PPS, PEN, mica, tantalum, electrolytic)',
    }),
  ),
  ratedVoltageV: Type.Optional(Type.Number({ minimum: 1, maximum: 10000, description: 'Rated voltage, V (1 V to 10 kV)' })),
  partNumber: Type.String({ minLength: 1, maxLength: 80, description: "The owner's own part number; unique within the catalogue" }),
  package: Type.Optional(Type.String({ minLength: 1, maxLength: 40, description: 'Package or case, e.g. 0603' })),
  status: Type.Union([Type.Literal('preferred'), Type.Literal('active'), Type.Literal('not-for-new-designs')], {
    description: 'not-for-new-designs parts are kept for BOM checks but never chosen by design or snap',
  }),
};

export const CataloguePart = Type.Object(partProperties, { $id: 'CataloguePart', additionalProperties: false, description: 'One approved part' });

export const CatalogueWrite = Type.Object(
  {
    name: Type.Optional(Type.String({ maxLength: 200, description: 'Display name (default: none; the id names the catalogue)' })),
    description: Type.Optional(Type.String({ maxLength: 2000, description: 'Free text for people, e.g. the approval list and its revision' })),
    parts: Type.Array(ref(CataloguePart), {
      minItems: 1,
      maxItems: MAX_CATALOGUE_PARTS,
      description: `The whole parts list (1 to ${MAX_CATALOGUE_PARTS}); a PUT replaces the previous list`,
    }),
  },
  { $id: 'CatalogueWrite', additionalProperties: false, description: 'A parts catalogue as written by its owner' },
);

export const CataloguePartRecord = Type.Object(
  {
    ...partProperties,
    valueSi: Type.Number({ description: 'The value in SI base units as the service read it: ohm for resistors, farad for capacitors' }),
  },
  { $id: 'CataloguePartRecord', additionalProperties: false, description: 'A stored part, with its value as the service read it' },
);

const storedMetadata = {
  id: Type.String({ description: 'Catalogue id, as in the path' }),
  version: Type.Integer({ minimum: 1, description: '1 on creation, +1 on every update' }),
  etag: Type.String({ description: 'Same as the ETag header: send it in If-Match to update or delete' }),
  createdAt: Type.String({ format: 'date-time', description: 'When the first PUT stored it (RFC 3339, UTC)' }),
  updatedAt: Type.String({ format: 'date-time', description: 'When the last PUT changed it (RFC 3339, UTC); equals createdAt until then' }),
};

export const Catalogue = Type.Object(
  {
    ...storedMetadata,
    name: Type.Optional(Type.String({ description: 'Display name (absent when the owner gave none)' })),
    description: Type.Optional(Type.String({ description: 'Free text from the owner (absent when none was given)' })),
    parts: Type.Array(ref(CataloguePartRecord), { description: 'The stored parts, in the order they were written' }),
  },
  { $id: 'Catalogue', additionalProperties: false, description: 'A stored parts catalogue' },
);

export const PartCounts = Type.Object(
  {
    total: Type.Integer({ description: 'Parts in the catalogue' }),
    resistors: Type.Integer({ description: 'Parts of kind resistor' }),
    capacitors: Type.Integer({ description: 'Parts of kind capacitor' }),
    notForNewDesigns: Type.Integer({ description: 'Parts with status not-for-new-designs (included in the totals)' }),
  },
  { additionalProperties: false, description: 'How many parts of each kind the catalogue holds' },
);

export const CatalogueSummary = Type.Object(
  {
    ...storedMetadata,
    name: Type.Optional(Type.String({ description: 'Display name (absent when the owner gave none)' })),
    partCounts: PartCounts,
  },
  { $id: 'CatalogueSummary', additionalProperties: false, description: 'A stored catalogue without its parts' },
);

export const CatalogueList = Type.Object(
  { catalogues: Type.Array(ref(CatalogueSummary), { description: 'Ordered by id' }) },
  { $id: 'CatalogueList', additionalProperties: false, description: 'Every stored catalogue, ordered by id, without its parts' },
);

export type CatalogueWriteBody = Static<typeof CatalogueWrite>;
export type CataloguePartBody = Static<typeof CataloguePart>;
export type CatalogueRecord = Static<typeof Catalogue>;
export type CatalogueSummaryRecord = Static<typeof CatalogueSummary>;

export const CATALOGUE_SCHEMAS = [CataloguePart, CatalogueWrite, CataloguePartRecord, Catalogue, CatalogueSummary, CatalogueList];
