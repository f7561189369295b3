/** Every shared schema, registered once with app.addSchema (order: dependencies first). */
import type { TSchema } from 'typebox';
import { Amplifier, AmplifierList, AmplifierRegistration } from './amplifier.ts';
import { Analysis } from './analysis.ts';
import { CATALOGUE_SCHEMAS } from './catalogue.ts';
import { CIRCUIT_SCHEMAS } from './circuit.ts';
import { SHARED_SCHEMAS } from './common.ts';
import { SERIES_SCHEMAS } from './series.ts';

export const REGISTERED_SCHEMAS: TSchema[] = [...SHARED_SCHEMAS, ...CIRCUIT_SCHEMAS, Analysis, Amplifier, AmplifierList, AmplifierRegistration, ...SERIES_SCHEMAS, ...CATALOGUE_SCHEMAS];
