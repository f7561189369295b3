/**
 * Where amplifier ids resolve: the built-in archetype table first (read-only),
 * then amplifiers callers registered in the store.
 *
 * The store answers asynchronously (it may sit across a network), while the
 * core resolves amplifier ids synchronously in the middle of a calculation. So
 * a request first reads the registered amplifiers it names (`forSpecs`), and the
 * core then resolves against that request-scoped lookup. Nothing is cached
 * across requests: a replica always sees what another replica just stored.
 */
import { BUILT_IN_AMPLIFIERS, findBuiltInAmplifier, isBuiltInAmplifierId, type AmplifierModel } from '../core/index.ts';

export interface RegisteredAmplifierSource {
  get(id: string): Promise<AmplifierModel | undefined>;
  list(): Promise<AmplifierModel[]>;
}

/** Synchronous resolution for one request (what the core's resolveAmplifier takes). */
export interface AmplifierLookup {
  get(id: string): AmplifierModel | undefined;
  readonly lookup: (id: string) => AmplifierModel | undefined;
}

export class AmplifierDirectory {
  constructor(private readonly registered?: RegisteredAmplifierSource) {}

  async get(id: string): Promise<AmplifierModel | undefined> {
    return findBuiltInAmplifier(id) ?? (await this.registered?.get(id));
  }

  async list(): Promise<AmplifierModel[]> {
    return [...BUILT_IN_AMPLIFIERS, ...((await this.registered?.list()) ?? [])];
  }

  /**
   * A lookup for one request. `specs` are the request's amplifier fields as sent
   * (an id string, inline figures, or absent): every id that is not built-in is
   * read from the store now, once, in parallel. Inline figures can only name a
   * built-in `base`, so they need no read.
   */
  async forSpecs(...specs: unknown[]): Promise<AmplifierLookup> {
    const ids = [...new Set(specs.filter((s): s is string => typeof s === 'string' && !isBuiltInAmplifierId(s)))];
    const found = new Map<string, AmplifierModel>();
    if (this.registered && ids.length > 0) {
      const source = this.registered;
      const models = await Promise.all(ids.map((id) => source.get(id)));
      ids.forEach((id, i) => {
        const model = models[i];
        if (model) found.set(id, model);
      });
    }
    const get = (id: string) => findBuiltInAmplifier(id) ?? found.get(id);
    return { get, lookup: get };
  }
}
