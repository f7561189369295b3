/** Every shared schema, registered once with app.addSchema (order: dependencies first). */
import type { TSchema } from 'typebox';
import { Amplifier, AmplifierList, AmplifierRegistration } from './amplifier.ts';
import { Analysis } from './analysis.ts';
import { BOM_SCHEMAS } from './bom.ts';
import { CATALOGUE_SCHEMAS } from './catalogue.ts';
import { CIRCUIT_SCHEMAS } from './circuit.ts';
import { FIT_SCHEMAS } from './fit.ts';
import { SHARED_SCHEMAS } from './common.ts';
import { SERIES_SCHEMAS } from './series.ts';
import { SNAP_SCHEMAS } from './snap.ts';
import { TOLERANCE_SCHEMAS } from './tolerance.ts';
import { DESIGN_SCHEMAS } from './design.ts';
import { WAVEFORM_SCHEMAS } from './waveform.ts';

export const REGISTERED_SCHEMAS: TSchema[] = [...SHARED_SCHEMAS, ...CIRCUIT_SCHEMAS, Analysis, Amplifier, AmplifierList, AmplifierRegistration, ...SERIES_SCHEMAS, ...CATALOGUE_SCHEMAS, ...BOM_SCHEMAS, ...FIT_SCHEMAS, ...SNAP_SCHEMAS, ...DESIGN_SCHEMAS, ...TOLERANCE_SCHEMAS, ...WAVEFORM_SCHEMAS];
