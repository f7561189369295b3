/** GET /v1/series and /v1/series/{name}: IEC 60063 preferred-number series over a decade range. */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import { SERIES_NAMES, isSeriesName, seriesMantissas, seriesTolerance, seriesValues, type SeriesName } from '../../core/parts/index.ts';
import { HttpProblem } from '../problem.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import { MAX_DECADE, MIN_DECADE, Series, SeriesList, SeriesName as SeriesNameParam, SeriesQuery } from '../schemas/series.ts';

interface DecadeRange {
  fromDecade: number;
  toDecade: number;
}

/** The query's decade exponents (already pattern-checked strings) -> a validated range. */
export function decadeRange(query: { fromDecade?: string; toDecade?: string }): DecadeRange {
  const from = decadeParam(query, 'fromDecade');
  const to = decadeParam(query, 'toDecade');
  const fromDecade = from ?? to ?? 0;
  const toDecade = to ?? fromDecade;
  if (toDecade < fromDecade) {
    throw new HttpProblem(400, 'validation', `toDecade (${toDecade}) is below fromDecade (${fromDecade})`, [
      { pointer: '/toDecade', in: 'query', detail: 'must not be below fromDecade' },
    ]);
  }
  return { fromDecade, toDecade };
}

function decadeParam(query: { fromDecade?: string; toDecade?: string }, name: 'fromDecade' | 'toDecade'): number | undefined {
  const text = query[name];
  if (text === undefined) return undefined;
  const value = Number(text);
  if (!Number.isInteger(value) || value < MIN_DECADE || value > MAX_DECADE) {
    throw new HttpProblem(400, 'validation', `${name} must be an integer in ${MIN_DECADE}..${MAX_DECADE}, got '${text}'`, [
      { pointer: `/${name}`, in: 'query', detail: `must be an integer in ${MIN_DECADE}..${MAX_DECADE}` },
    ]);
  }
  return value;
}

/**
 * Values in [10^from, 10^(to+1)). The bounds are pulled inwards by less than the
 * gap to the neighbouring series value (the widest step below a power of ten is
 * E192's 9.88 -> 10, 1.2 %), so float rounding of 10^n cannot add or drop an edge value.
 */
function valuesOver(name: SeriesName, range: DecadeRange): number[] {
  return seriesValues(name, 10 ** range.fromDecade * 0.999, 10 ** (range.toDecade + 1) * 0.995);
}

export const seriesRoutes: FastifyPluginAsyncTypebox = async (app) => {
  app.get(
    '/v1/series',
    {
      schema: {
        tags: ['parts'],
        summary: 'List the IEC 60063 preferred-number series',
        response: { 200: ref(SeriesList), ...problemResponses(401, 403) },
      },
    },
    async () => ({
      series: SERIES_NAMES.map((name) => ({ name, valuesPerDecade: seriesMantissas(name).length, tolerance: seriesTolerance(name) })),
    }),
  );

  app.get(
    '/v1/series/:name',
    {
      schema: {
        tags: ['parts'],
        summary: 'One IEC 60063 series over a range of decades',
        description:
          'The mantissas of one decade and the values from 10^fromDecade up to, not including, 10^(toDecade+1). ' +
          'Without a range the values are the decade starting at 1. Values are unit-free: read them as ohm or farad.',
        params: Type.Object({ name: SeriesNameParam }),
        querystring: SeriesQuery,
        response: { 200: ref(Series), ...problemResponses(400, 401, 403, 404) },
      },
    },
    async (request) => {
      const name = request.params.name.toUpperCase();
      if (!isSeriesName(name)) {
        throw new HttpProblem(404, 'not-found', `No preferred-number series '${request.params.name}' (known: ${SERIES_NAMES.join(', ')})`);
      }
      const range = decadeRange(request.query);
      const mantissas = [...seriesMantissas(name)];
      return {
        name,
        valuesPerDecade: mantissas.length,
        significantFigures: mantissas.length > 24 ? 3 : 2,
        tolerance: seriesTolerance(name),
        toleranceBasis: 'common practice' as const,
        mantissas,
        ...range,
        values: valuesOver(name, range),
      };
    },
  );
};
