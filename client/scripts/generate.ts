/** Writes client/src/schema.ts from openapi/openapi.json (run from the repository root). */
import { readFileSync, writeFileSync } from 'node:fs';
import { CONTRACT_PATH, SCHEMA_PATH, generateSchemaSource } from '../generate.ts';

const contract = JSON.parse(readFileSync(CONTRACT_PATH, 'utf8')) as object;
writeFileSync(SCHEMA_PATH, await generateSchemaSource(contract));
console.log(`wrote ${SCHEMA_PATH}`);
