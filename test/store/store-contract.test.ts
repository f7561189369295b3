/**
 * The Store contract (src/store/types.ts), run against BOTH backends: the
 * embedded SQLite file and a throwaway PostgreSQL database. Precondition
 * semantics follow RFC 9110 §13.1.1 (If-Match) and RFC 6585 §3 (428).
 */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { StoreError, type StoreErrorCode } from '../../src/store/errors.ts';
import type { Store } from '../../src/store/types.ts';
import { backendsUnderTest, type FreshDatabase } from './backends.ts';

async function storeErrorCode(work: () => Promise<unknown>): Promise<StoreErrorCode | 'no error' | 'other error'> {
  try {
    await work();
    return 'no error';
  } catch (error) {
    return error instanceof StoreError ? error.code : 'other error';
  }
}

// RFC 9110 §8.8.3: entity-tag = [ weak ] opaque-tag; opaque-tag = DQUOTE *etagc DQUOTE,
// etagc = %x21 / %x23-7E / obs-text. A strong tag has no W/ prefix.
const STRONG_ETAG = /^"[\x21\x23-\x7e]*"$/;

for (const backend of await backendsUnderTest()) {
  describe.skipIf(backend.skip !== undefined)(`store contract on ${backend.name}${backend.skip ? ` (skipped: ${backend.skip})` : ''}`, () => {
    beforeAll(() => backend.setUp(), 60_000);
    afterAll(() => backend.tearDown(), 60_000);
    afterEach(() => backend.cleanUp());

    let database: FreshDatabase;
    async function open(): Promise<Store> {
      database = await backend.fresh();
      return database.open();
    }

    describe('document CRUD', () => {
      it('creates, reads, updates and deletes with increasing versions and changing ETags', async () => {
        const store = await open();
        expect(store.backend).toBe(backend.name);
        const created = await store.catalogues.put('bench-a', { parts: ['4k7'] }, undefined);
        expect(created.outcome).toBe('created');
        expect(created.doc.version).toBe(1);
        expect(created.doc.etag).toMatch(STRONG_ETAG);
        expect(created.doc.body).toEqual({ parts: ['4k7'] });
        expect(await store.catalogues.get('bench-a')).toEqual(created.doc);

        const updated = await store.catalogues.put('bench-a', { parts: ['4k7', '10n'] }, created.doc.etag);
        expect(updated.outcome).toBe('updated');
        expect(updated.doc.version).toBe(2);
        expect(updated.doc.etag).toMatch(STRONG_ETAG);
        expect(updated.doc.etag).not.toBe(created.doc.etag);
        expect(updated.doc.createdAt).toBe(created.doc.createdAt);
        expect(Date.parse(updated.doc.updatedAt)).toBeGreaterThanOrEqual(Date.parse(created.doc.updatedAt));
        expect((await store.catalogues.get('bench-a'))?.body).toEqual({ parts: ['4k7', '10n'] });

        const third = await store.catalogues.put('bench-a', { parts: [] }, updated.doc.etag);
        expect(third.doc.version).toBe(3);
        expect(new Set([created.doc.etag, updated.doc.etag, third.doc.etag]).size).toBe(3);

        await store.catalogues.delete('bench-a', third.doc.etag);
        expect(await store.catalogues.get('bench-a')).toBeUndefined();
        expect(await store.catalogues.list()).toEqual([]);
      });

      it('writes ISO 8601 UTC timestamps (RFC 3339 profile)', async () => {
        const store = await open();
        const { doc } = await store.amplifiers.put('stamped', { v: 1 }, undefined);
        for (const stamp of [doc.createdAt, doc.updatedAt]) {
          expect(stamp).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
          expect(new Date(stamp).toISOString()).toBe(stamp);
        }
      });

      it('keeps collections apart', async () => {
        const store = await open();
        await store.catalogues.put('same-id', { kind: 'catalogue' }, undefined);
        await store.amplifiers.put('same-id', { kind: 'amplifier' }, undefined);
        expect((await store.catalogues.get('same-id'))?.body).toEqual({ kind: 'catalogue' });
        expect((await store.amplifiers.get('same-id'))?.body).toEqual({ kind: 'amplifier' });
        expect((await store.catalogues.get('same-id'))?.etag).not.toBe((await store.amplifiers.get('same-id'))?.etag);
      });

      it('lists summaries and full documents ordered by id (byte order)', async () => {
        const store = await open();
        const ids = ['zeta', 'alpha.2', 'alpha-1', '9lives', 'alpha_3', 'm'];
        for (const id of ids) await store.amplifiers.put(id, { name: id, note: 'é' }, undefined);
        // Expected order from JavaScript's code-unit sort, independent of the database (ids are ASCII).
        const expectedOrder = [...ids].sort();
        const summaries = await store.amplifiers.list();
        expect(summaries.map((s) => s.id)).toEqual(expectedOrder);
        for (const summary of summaries) {
          expect(summary).not.toHaveProperty('body');
          expect(summary.version).toBe(1);
          expect(summary.etag).toBe((await store.amplifiers.get(summary.id))?.etag);
          // Byte length per the UTF-8 encoding of the stored JSON (Node's Buffer as the reference).
          expect(summary.bodyBytes).toBe(Buffer.byteLength(JSON.stringify({ name: summary.id, note: 'é' }), 'utf8'));
        }
        expect((await store.amplifiers.listWithBodies()).map((d) => [d.id, d.body.name])).toEqual(expectedOrder.map((id) => [id, id]));
      });

      it('does not reuse an ETag when an id is deleted and created again', async () => {
        const store = await open();
        const first = await store.catalogues.put('reborn', { n: 1 }, undefined);
        await store.catalogues.delete('reborn', first.doc.etag);
        const second = await store.catalogues.put('reborn', { n: 2 }, undefined);
        expect(second.doc.version).toBe(1);
        expect(second.doc.etag).not.toBe(first.doc.etag);
        expect(await storeErrorCode(() => store.catalogues.put('reborn', { n: 3 }, first.doc.etag))).toBe('precondition-failed');
      });
    });

    describe('preconditions', () => {
      it('requires an ETag to change or delete an existing document (428)', async () => {
        const store = await open();
        await store.catalogues.put('guarded', { v: 1 }, undefined);
        expect(await storeErrorCode(() => store.catalogues.put('guarded', { v: 2 }, undefined))).toBe('precondition-required');
        expect(await storeErrorCode(() => store.catalogues.put('guarded', { v: 2 }, '  '))).toBe('precondition-required');
        expect(await storeErrorCode(() => store.catalogues.delete('guarded', undefined))).toBe('precondition-required');
        expect((await store.catalogues.get('guarded'))?.version).toBe(1);
      });

      it('rejects a stale or weak ETag with precondition-failed and leaves the document unchanged', async () => {
        const store = await open();
        const v1 = (await store.catalogues.put('guarded', { v: 1 }, undefined)).doc;
        const v2 = (await store.catalogues.put('guarded', { v: 2 }, v1.etag)).doc;
        expect(await storeErrorCode(() => store.catalogues.put('guarded', { v: 3 }, v1.etag))).toBe('precondition-failed');
        expect(await storeErrorCode(() => store.catalogues.delete('guarded', v1.etag))).toBe('precondition-failed');
        // Strong comparison: W/"x" never matches "x" (RFC 9110 §8.8.3.2).
        expect(await storeErrorCode(() => store.catalogues.put('guarded', { v: 3 }, `W/${v2.etag}`))).toBe('precondition-failed');
        expect(await store.catalogues.get('guarded')).toEqual(v2);
      });

      it('reports the current ETag when refusing a stale one', async () => {
        const store = await open();
        const v1 = (await store.catalogues.put('told', { v: 1 }, undefined)).doc;
        const v2 = (await store.catalogues.put('told', { v: 2 }, v1.etag)).doc;
        const error = await store.catalogues.put('told', { v: 3 }, v1.etag).catch((e: unknown) => e);
        expect(error).toBeInstanceOf(StoreError);
        expect((error as StoreError).details).toMatchObject({ currentEtag: v2.etag });
      });

      it('accepts If-Match: * for an existing document and rejects it for a missing one', async () => {
        const store = await open();
        expect(await storeErrorCode(() => store.catalogues.put('absent', { v: 1 }, '*'))).toBe('precondition-failed');
        expect(await store.catalogues.get('absent')).toBeUndefined();
        await store.catalogues.put('present', { v: 1 }, undefined);
        expect((await store.catalogues.put('present', { v: 2 }, '*')).doc.version).toBe(2);
        expect(await storeErrorCode(() => store.catalogues.delete('absent', '*'))).toBe('not-found');
      });

      it('rejects creating a new id when an If-Match is given', async () => {
        const store = await open();
        const other = (await store.catalogues.put('other', { v: 1 }, undefined)).doc;
        expect(await storeErrorCode(() => store.catalogues.put('fresh', { v: 1 }, other.etag))).toBe('precondition-failed');
        expect(await store.catalogues.get('fresh')).toBeUndefined();
      });

      it('supports create-only puts (If-None-Match: *)', async () => {
        const store = await open();
        expect((await store.catalogues.put('once', { v: 1 }, undefined, { createOnly: true })).outcome).toBe('created');
        expect(await storeErrorCode(() => store.catalogues.put('once', { v: 2 }, undefined, { createOnly: true }))).toBe('precondition-failed');
        expect((await store.catalogues.get('once'))?.body).toEqual({ v: 1 });
      });

      it('reports not-found for deleting a missing id', async () => {
        const store = await open();
        expect(await storeErrorCode(() => store.catalogues.delete('nothing-here', '"1-0000"'))).toBe('not-found');
        expect(await storeErrorCode(() => store.catalogues.delete('nothing-here', undefined))).toBe('not-found');
      });

      it('lets exactly one of two handles on the same database win with the same ETag', async () => {
        const first = await open();
        const second = await database.open();
        const base = (await first.catalogues.put('contested', { by: 'none' }, undefined)).doc;
        expect((await second.catalogues.get('contested'))?.etag).toBe(base.etag);
        const outcomes = await Promise.all([
          storeErrorCode(() => first.catalogues.put('contested', { by: 'first' }, base.etag)),
          storeErrorCode(() => second.catalogues.put('contested', { by: 'second' }, base.etag)),
        ]);
        expect([...outcomes].sort()).toEqual(['no error', 'precondition-failed']);
        const winner = outcomes[0] === 'no error' ? 'first' : 'second';
        expect(await second.catalogues.get('contested')).toMatchObject({ version: 2, body: { by: winner } });
      });

      it('lets exactly one of many concurrent create-only puts create the id', async () => {
        const first = await open();
        const second = await database.open();
        const outcomes = await Promise.all(
          Array.from({ length: 12 }, (_, i) =>
            storeErrorCode(() => (i % 2 === 0 ? first : second).amplifiers.put('raced', { by: i }, undefined, { createOnly: true })),
          ),
        );
        expect(outcomes.filter((o) => o === 'no error')).toHaveLength(1);
        expect(outcomes.filter((o) => o === 'precondition-failed')).toHaveLength(11);
        expect((await first.amplifiers.get('raced'))?.version).toBe(1);
      });
    });

    describe('ids, health and damage', () => {
      it('refuses to store under an invalid id and treats reads of one as missing', async () => {
        const store = await open();
        expect(await storeErrorCode(() => store.catalogues.put('Bad Id', { v: 1 }, undefined))).toBe('invalid-id');
        expect(await store.catalogues.get('Bad Id')).toBeUndefined();
        expect(await storeErrorCode(() => store.catalogues.delete('Bad Id', '"x"'))).toBe('not-found');
      });

      it('reads back through a new handle after the first is closed', async () => {
        const writer = await open();
        const written = (await writer.amplifiers.put('kept', { slewRateVPerS: 0.5e6, label: 'kept' }, undefined)).doc;
        const again = (await writer.amplifiers.put('kept', { slewRateVPerS: 1.5e6, label: 'kept' }, written.etag)).doc;
        await writer.close();
        await writer.close(); // idempotent
        const reader = await database.open();
        expect(await reader.amplifiers.get('kept')).toEqual(again);
        expect((await reader.amplifiers.list()).map((d) => d.id)).toEqual(['kept']);
      });

      it('ping answers true while open and false after close', async () => {
        const store = await open();
        expect(await store.ping()).toBe(true);
        await store.close();
        expect(await store.ping()).toBe(false);
      });

      it('reports an unreadable stored body as corrupt instead of crashing', async () => {
        const store = await open();
        await store.catalogues.put('fine', { ok: true }, undefined);
        await store.catalogues.put('broken', { ok: true }, undefined);
        await store.catalogues.put('array', { ok: true }, undefined);
        await database.damage('catalogues', 'broken', '{"ok": tru');
        await database.damage('catalogues', 'array', '[1,2]');

        expect((await store.catalogues.get('fine'))?.body).toEqual({ ok: true });
        const caught = await store.catalogues.get('broken').catch((e: unknown) => e);
        expect(caught).toBeInstanceOf(StoreError);
        expect((caught as StoreError).code).toBe('corrupt');
        expect((caught as StoreError).message).toContain('catalogues/broken');
        expect(await storeErrorCode(() => store.catalogues.get('array'))).toBe('corrupt');
        expect(await storeErrorCode(() => store.catalogues.listWithBodies())).toBe('corrupt');
        // Summaries do not parse bodies, so a listing still works and shows the damaged ids.
        expect((await store.catalogues.list()).map((d) => d.id)).toEqual(['array', 'broken', 'fine']);
      });
    });
  });
}
