import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import {
  REFERENCE_RATES_MAX_BYTES,
  referenceRateColumns,
  referenceRatesQuerySchema,
  referenceTemplateCsv,
  sirQuerySchema,
} from '@ratewarden/shared/reference-rates';
import { authorize } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { firstFile } from '../../lib/multipart-file';
import { tooLarge } from '../../lib/byte-meter';
import { listReferenceTables, receiveReferenceTable, referenceRatesOf } from './reference-rates-service';
import { runSir } from './run-sir';

/** Reads an uploaded file whole (reference tables are small), refusing it past the limit. */
async function readAll(stream: NodeJS.ReadableStream, maxBytes: number): Promise<Buffer> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of stream) {
    size += (chunk as Buffer).length;
    if (size > maxBytes) throw tooLarge(maxBytes);
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks);
}

const runRef = z.union([z.literal('current'), z.string().uuid()]);

/**
 * External reference rates, mounted at /api/reference-rates: the format and its template, the
 * upload (hygienist), the versions and one version's rates; and the SIR of a run per exposure
 * group (`/runs/:id/sir`, `current` for the current run), read by readers of aggregates.
 */
export function referenceRatesRouter({ dataSource: ds }: { dataSource: DataSource }): Router {
  const router = Router();
  router.get('/formats', authorize('intake:formats'), (_req, res) => {
    res.json(referenceRateColumns);
  });
  router.get('/template.csv', authorize('intake:formats'), (_req, res) => {
    res.type('text/csv; charset=utf-8').attachment('ratewarden-reference-rates-template.csv').send(referenceTemplateCsv());
  });
  router.post('/', authorize('reference:write'), async (req, res) => {
    if (Number(req.get('content-length') ?? 0) > REFERENCE_RATES_MAX_BYTES + 1024 * 1024) {
      res.set('connection', 'close');
      req.resume();
      throw tooLarge(REFERENCE_RATES_MAX_BYTES);
    }
    const file = await firstFile(req, REFERENCE_RATES_MAX_BYTES).catch((err: unknown) => {
      res.set('connection', 'close');
      throw err;
    });
    let bytes: Buffer;
    try {
      // The file's stream ends only once the whole request body has been read well-formed (multipart-file.ts).
      bytes = await readAll(file.stream, REFERENCE_RATES_MAX_BYTES);
    } catch (err) {
      res.set('connection', 'close');
      file.stream.resume();
      throw err instanceof AppError ? err : new AppError('bad_request', 'the upload broke off; send the file again');
    }
    const result = await receiveReferenceTable(ds, { fileName: file.fileName, bytes, principal: req.principal!, ip: req.ip });
    res.status(result.duplicate ? 200 : 201).json(result);
  });
  router.get('/', authorize('aggregates:read'), async (_req, res) => {
    res.json(await listReferenceTables(ds));
  });
  router.get('/rates', authorize('aggregates:read'), async (req, res) => {
    res.json(await referenceRatesOf(ds, referenceRatesQuerySchema.parse(req.query).version));
  });
  router.get('/runs/:id/sir', authorize('aggregates:read'), async (req, res) => {
    res.json(await runSir(ds, runRef.parse(req.params.id), sirQuerySchema.parse(req.query), req.principal!));
  });
  return router;
}
