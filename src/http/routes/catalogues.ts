/**
 * Stored parts catalogues: GET (list and one), PUT (create or replace), DELETE.
 * Every version carries a strong ETag; changing or deleting an existing
 * catalogue needs If-Match (428 without, 412 when stale), so two editors cannot
 * silently overwrite each other. Bodies are validated in full before the store
 * sees them: a rejected request leaves the stored version untouched.
 */
import type { FastifyPluginAsyncTypebox } from '@fastify/type-provider-typebox';
import { Type } from 'typebox';
import type { CataloguePart } from '../../core/parts/index.ts';
import { StoreError, type CatalogueBody, type StoredDocument } from '../../store/index.ts';
import { readCatalogueParts } from '../catalogue-source.ts';
import { ETAG_HEADER, ifMatchForStore, ifNoneMatchHits, jsonResponse, PRECONDITION_HEADERS } from '../preconditions.ts';
import { problemResponses, ref } from '../schemas/common.ts';
import {
  Catalogue,
  CatalogueId,
  CatalogueList,
  CatalogueWrite,
  type CatalogueRecord,
  type CatalogueSummaryRecord,
  type CatalogueWriteBody,
} from '../schemas/catalogue.ts';

// ---------------------------------------------------------------- representation

function catalogueRecord(doc: StoredDocument<CatalogueBody>, parts: CataloguePart[]): CatalogueRecord {
  const body = doc.body as unknown as CatalogueWriteBody;
  const record: CatalogueRecord = {
    id: doc.id,
    version: doc.version,
    etag: doc.etag,
    createdAt: doc.createdAt,
    updatedAt: doc.updatedAt,
    parts: body.parts.map((p, i) => ({ ...p, valueSi: parts[i].value })),
  };
  if (body.name !== undefined) record.name = body.name;
  if (body.description !== undefined) record.description = body.description;
  return record;
}

/** Reading a stored body back is the store's contract: a failure here is corruption, not a bad request. */
function storedParts(doc: StoredDocument<CatalogueBody>): CataloguePart[] {
  try {
    return readCatalogueParts(doc.body as unknown as CatalogueWriteBody);
  } catch (error) {
    throw new StoreError('corrupt', `stored catalogue '${doc.id}' no longer reads`, { id: doc.id }, { cause: error });
  }
}

function summaryOf(doc: StoredDocument<CatalogueBody>): CatalogueSummaryRecord {
  const body = doc.body as unknown as CatalogueWriteBody;
  const parts = Array.isArray(body.parts) ? body.parts : [];
  const summary: CatalogueSummaryRecord = {
    id: doc.id,
    version: doc.version,
    etag: doc.etag,
    createdAt: doc.createdAt,
    updatedAt: doc.updatedAt,
    partCounts: {
      total: parts.length,
      resistors: parts.filter((p) => p.kind === 'resistor').length,
      capacitors: parts.filter((p) => p.kind === 'capacitor').length,
      notForNewDesigns: parts.filter((p) => p.status === 'not-for-new-designs').length,
    },
  };
  if (typeof body.name === 'string') summary.name = body.name;
  return summary;
}

// ---------------------------------------------------------------- routes

const idParams = Type.Object({ id: CatalogueId });

export const catalogueRoutes: FastifyPluginAsyncTypebox = async (app) => {
  const collection = app.services.store.catalogues;
  // Summaries need name and part counts, which live in the bodies. An ETag names one
  // version exactly, so a summary computed once per ETag never goes stale, even with
  // several replicas writing to a shared store; a listing only loads changed bodies.
  const summaries = new Map<string, CatalogueSummaryRecord>();

  app.get(
    '/v1/catalogues',
    {
      schema: {
        tags: ['catalogues'],
        summary: 'List stored catalogues',
        response: { 200: ref(CatalogueList), ...problemResponses(401, 403) },
      },
    },
    async () => {
      const out: CatalogueSummaryRecord[] = [];
      const present = new Set<string>();
      for (const meta of await collection.list()) {
        present.add(meta.id);
        let summary = summaries.get(meta.id);
        if (summary?.etag !== meta.etag) {
          const doc = await collection.get(meta.id);
          if (!doc) continue; // deleted between list() and get()
          summary = summaryOf(doc);
          summaries.set(meta.id, summary);
        }
        out.push(summary);
      }
      for (const id of summaries.keys()) if (!present.has(id)) summaries.delete(id);
      return { catalogues: out };
    },
  );

  app.get(
    '/v1/catalogues/:id',
    {
      schema: {
        tags: ['catalogues'],
        summary: 'Get one catalogue',
        description: 'Send If-None-Match with a held ETag to get 304 when nothing changed.',
        params: idParams,
        headers: Type.Object({ 'if-none-match': Type.Optional(Type.String({ description: 'ETag(s) already held' })) }),
        response: {
          200: jsonResponse('The catalogue', ref(Catalogue)),
          304: { description: 'Not modified since the ETag in If-None-Match', type: 'null', headers: ETAG_HEADER },
          ...problemResponses(400, 401, 403, 404),
        },
      },
    },
    async (request, reply) => {
      const doc = await collection.get(request.params.id);
      if (!doc) throw new StoreError('not-found', `No catalogue with id '${request.params.id}'`);
      reply.header('etag', doc.etag);
      if (ifNoneMatchHits(request.headers['if-none-match'], doc.etag)) return reply.code(304).send(undefined as never);
      return reply.code(200).send(catalogueRecord(doc, storedParts(doc)) as never);
    },
  );

  app.put(
    '/v1/catalogues/:id',
    {
      schema: {
        tags: ['catalogues'],
        summary: 'Create or replace a catalogue',
        description:
          'Creates the catalogue (201) or replaces it (200). Replacing needs the current ETag in If-Match; ' +
          '`If-None-Match: *` makes the request create-only. Every part is checked before anything is stored.',
        params: idParams,
        headers: Type.Object({
          'if-match': PRECONDITION_HEADERS.properties['if-match'],
          'if-none-match': Type.Optional(Type.Literal('*', { description: '* = create only: 412 if the id exists' })),
        }),
        body: ref(CatalogueWrite),
        response: {
          200: jsonResponse('Replaced', ref(Catalogue)),
          201: jsonResponse('Created', ref(Catalogue), { ...ETAG_HEADER, location: { type: 'string', description: 'URL of the new catalogue' } }),
          ...problemResponses(400, 401, 403, 409, 412, 413, 415, 428),
        },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      // Validate first: nothing reaches the store unless every part reads.
      const parts = readCatalogueParts(request.body);
      const expected = await ifMatchForStore(request.headers['if-match'], async () => (await collection.get(id))?.etag);
      const result = await collection.put(id, request.body as unknown as CatalogueBody, expected, {
        createOnly: request.headers['if-none-match'] === '*',
      });
      reply.header('etag', result.doc.etag);
      if (result.outcome === 'created') reply.code(201).header('location', `/v1/catalogues/${id}`);
      else reply.code(200);
      return reply.send(catalogueRecord(result.doc, parts) as never);
    },
  );

  app.delete(
    '/v1/catalogues/:id',
    {
      schema: {
        tags: ['catalogues'],
        summary: 'Delete a catalogue',
        description: 'Needs the current ETag in If-Match.',
        params: idParams,
        headers: PRECONDITION_HEADERS,
        response: { 204: { description: 'Deleted', type: 'null' }, ...problemResponses(400, 401, 403, 404, 409, 412, 428) },
      },
    },
    async (request, reply) => {
      const { id } = request.params;
      await collection.delete(id, await ifMatchForStore(request.headers['if-match'], async () => (await collection.get(id))?.etag));
      summaries.delete(id);
      return reply.code(204).send(null);
    },
  );
};
