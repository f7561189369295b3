/**
 * An approved-parts catalogue as the core sees it: values already in SI units.
 * The HTTP layer validates and converts stored catalogue bodies into this shape.
 */
export type CataloguePartKind = 'resistor' | 'capacitor';
export type PartStatus = 'preferred' | 'active' | 'not-for-new-designs';

export interface CataloguePart {
  kind: CataloguePartKind;
  /** Resistance in ohm or capacitance in farad. */
  value: number;
  /** Tolerance as a fraction (0.01 = 1 %). */
  tolerance: number;
  /** Temperature coefficient, ppm/K (resistors, or capacitors given explicitly). */
  tempcoPpmPerK?: number;
  /** EIA-198 or family code for capacitors ("C0G", "X7R", "film-pp"...). */
  dielectric?: string;
  ratedVoltageV?: number;
  /** The owner's own part number. */
  partNumber: string;
  package?: string;
  status: PartStatus;
}

export interface Catalogue {
  id: string;
  name?: string;
  parts: CataloguePart[];
}

/** Parts of one kind usable in new designs, sorted by value (for bisection). */
export function designableParts(catalogue: Catalogue, kind: CataloguePartKind): CataloguePart[] {
  return catalogue.parts.filter((p) => p.kind === kind && p.status !== 'not-for-new-designs').sort((a, b) => a.value - b.value);
}
