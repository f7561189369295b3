/**
 * Where amplifier ids resolve: the built-in archetype table first (read-only),
 * then amplifiers callers registered in the store.
 */
import { BUILT_IN_AMPLIFIERS, findBuiltInAmplifier, type AmplifierModel } from '../core/index.ts';

export interface RegisteredAmplifierSource {
  get(id: string): AmplifierModel | undefined;
  list(): AmplifierModel[];
}

export class AmplifierDirectory {
  constructor(private readonly registered?: RegisteredAmplifierSource) {}

  get(id: string): AmplifierModel | undefined {
    return findBuiltInAmplifier(id) ?? this.registered?.get(id);
  }

  list(): AmplifierModel[] {
    return [...BUILT_IN_AMPLIFIERS, ...(this.registered?.list() ?? [])];
  }

  readonly lookup = (id: string) => this.get(id);
}
