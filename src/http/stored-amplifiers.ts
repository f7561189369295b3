/** Registered amplifiers live in the store as validated bodies; this turns them into models. */
import { resolveAmplifier, type AmplifierModel } from '../core/index.ts';
import { findBuiltInAmplifier } from '../core/amplifiers/archetypes.ts';
import type { Store } from '../store/index.ts';
import type { RegisteredAmplifierSource } from './amplifier-directory.ts';
import { inlineAmplifierFromBody } from './convert.ts';

export function storedBodyToModel(id: string, body: Record<string, unknown>): AmplifierModel {
  const inline = inlineAmplifierFromBody(body);
  const model = resolveAmplifier(inline, findBuiltInAmplifier, `/amplifiers/${id}`);
  return {
    ...model,
    id,
    name: typeof body.name === 'string' ? body.name : id,
    technologyClass: typeof body.technologyClass === 'string' ? body.technologyClass : model.technologyClass,
    description: typeof body.description === 'string' ? body.description : model.description,
  };
}

export function storedAmplifierSource(store: Store): RegisteredAmplifierSource {
  return {
    async get(id) {
      const doc = await store.amplifiers.get(id);
      return doc ? storedBodyToModel(id, doc.body) : undefined;
    },
    async list() {
      return (await store.amplifiers.listWithBodies()).map((d) => storedBodyToModel(d.id, d.body));
    },
  };
}
