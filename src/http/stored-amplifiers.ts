/** Registered amplifiers live in the store as validated bodies; this turns them into models. */
import { CoreError, resolveAmplifier, type AmplifierModel } from '../core/index.ts';
import { findBuiltInAmplifier } from '../core/amplifiers/archetypes.ts';
import type { Store } from '../store/index.ts';
import type { RegisteredAmplifierSource } from './amplifier-directory.ts';
import { inlineAmplifierFromBody } from './convert.ts';

/**
 * A stored body through the same resolution and validation as an inline
 * amplifier. A body stored before the figure ranges were tightened may no longer
 * pass: it is then refused on use (422, naming the figure) until re-registered,
 * never run through the physics.
 */
export function storedBodyToModel(id: string, body: Record<string, unknown>): AmplifierModel {
  const inline = inlineAmplifierFromBody(body);
  let model: AmplifierModel;
  try {
    model = resolveAmplifier(inline, findBuiltInAmplifier, '');
  } catch (err) {
    if (err instanceof CoreError && err.code === 'invalid-value') {
      throw new CoreError('unknown-reference', `Registered amplifier '${id}' no longer passes validation (${err.pointer ?? ''}: ${err.message}); register it again with corrected figures`);
    }
    throw err;
  }
  return {
    ...model,
    id,
    name: typeof body.name === 'string' ? body.name : id,
    technologyClass: typeof body.technologyClass === 'string' ? body.technologyClass : model.technologyClass,
    description: typeof body.description === 'string' ? body.description : model.description,
  };
}

function usable(id: string, body: Record<string, unknown>): AmplifierModel | undefined {
  try {
    return storedBodyToModel(id, body);
  } catch {
    return undefined;
  }
}

export function storedAmplifierSource(store: Store): RegisteredAmplifierSource {
  return {
    async get(id) {
      const doc = await store.amplifiers.get(id);
      return doc ? storedBodyToModel(id, doc.body) : undefined;
    },
    // The list shows the amplifiers a request can use; a stale record answers 422 when fetched by id.
    async list() {
      return (await store.amplifiers.listWithBodies()).flatMap((d) => usable(d.id, d.body) ?? []);
    },
  };
}
