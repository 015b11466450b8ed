import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { provisionUser } from '../support/sign-in';
import { openTestDataSource } from '../support/test-db';
import {
  abortedPost,
  BOUNDARY,
  closing,
  filePart,
  health,
  MULTIPART,
  multipartBody,
  rawPost,
  signInToProcess,
  startApiProcess,
  type ApiProcess,
  type ProcessSession,
} from './intake-api-process';
import { makeCorner, type Corner } from './intake-support';

/**
 * Broken multipart bodies against the real server process: each is answered with 400 and a
 * message, and the process keeps answering. Before, a body without its closing boundary ended the
 * process (busboy failed the file stream before anyone listened to it).
 */
describe('broken multipart uploads', () => {
  let ds: DataSource;
  let c: Corner;
  let api: ApiProcess;
  let hyg: ProcessSession;
  const path = '/api/intakes?kind=roster&mode=check';
  let n = 0;
  const roster = () =>
    c.fill(`worker_key,site,exposure_group,month,hours,birth_year,sex\n{W}${++n},{S1},{GA},2025-01,160,1980,F\n{W}${++n},{S1},{GB},2025-01,120,1975,M\n`);

  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
    api = await startApiProcess();
    hyg = await signInToProcess(api, 'hygienist@demo.ratewarden.test');
  });
  afterAll(async () => {
    await api?.stop();
    await ds?.destroy();
  });

  const stillServing = async () => {
    expect(api.alive(), api.stderr()).toBe(true);
    expect(await health(api.baseUrl)).toBe(200);
  };

  it('answers a body without its closing boundary with 400, in one piece or cut inside the file', async () => {
    const whole = multipartBody(roster());
    for (const cut of [whole.length - closing().length, whole.length - closing().length - 20, 60]) {
      const res = await rawPost(api.baseUrl, path, hyg, MULTIPART, whole.subarray(0, cut));
      expect(res.status).toBe(400);
      expect(res.body?.message).toMatch(/upload broke off/);
      await stillServing();
    }
  });

  it('answers a multipart type without a boundary with 400', async () => {
    const res = await rawPost(api.baseUrl, path, hyg, 'multipart/form-data', multipartBody(roster()));
    expect(res).toMatchObject({ status: 400, body: { code: 'bad_request', message: 'the multipart request has no boundary' } });
    await stillServing();
  });

  it('answers a body with a boundary but no file part with 400', async () => {
    const field = Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="note"\r\n\r\nhello\r\n--${BOUNDARY}--\r\n`);
    const res = await rawPost(api.baseUrl, path, hyg, MULTIPART, field);
    expect(res).toMatchObject({ status: 400, body: { code: 'bad_request', message: 'the request holds no file; attach the CSV as a file field' } });
    const empty = await rawPost(api.baseUrl, path, hyg, MULTIPART, Buffer.alloc(0));
    expect(empty.status).toBe(400);
    expect(empty.body?.message).toBeTruthy();
    await stillServing();
  });

  it('takes the first of two files and ignores the second', async () => {
    const first = roster();
    const res = await rawPost(api.baseUrl, path, hyg, MULTIPART, Buffer.concat([filePart(first, 'one.csv'), filePart('not,a,roster\n', 'two.csv'), closing()]));
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ intake: { state: 'checked', fileName: 'one.csv', rowCount: 2 } });
    // Two files, the second cut short: the first is read whole, the broken body still ends in 400.
    const first3 = filePart(roster(), 'three.csv');
    const broken = Buffer.concat([first3, filePart('worker_key,site\n', 'four.csv')]);
    expect((await rawPost(api.baseUrl, path, hyg, MULTIPART, broken)).status).toBe(400);
    // Also when the first file has long arrived before the body breaks: no intake is taken from it.
    const late = Buffer.concat([filePart(roster(), 'five.csv'), filePart('worker_key,site\n', 'six.csv')]);
    expect((await rawPost(api.baseUrl, path, hyg, MULTIPART, late, { pauseAt: late.lastIndexOf('worker_key,site') })).status).toBe(400);
    expect(await ds.query(`SELECT count(*)::int AS n FROM intakes WHERE file_name IN ('three.csv', 'five.csv')`)).toEqual([{ n: 0 }]);
    await stillServing();
  });

  it('survives a connection that hangs up mid-body, and leaves no intake or transaction behind', async () => {
    const before = await ds.query(`SELECT count(*)::int AS n FROM intakes`);
    const body = multipartBody(roster() + 'x'.repeat(200_000));
    for (const sent of [10, 200, 5_000]) {
      await abortedPost(api.baseUrl, path, hyg, MULTIPART, body.subarray(0, sent), body.length);
      await stillServing();
    }
    // Hanging up after the header row: the intake is under way when the connection goes.
    const head = Buffer.concat([filePart(roster()).subarray(0, -2)]);
    await abortedPost(api.baseUrl, path, hyg, MULTIPART, head, head.length + 100_000);
    await stillServing();
    await expect
      .poll(
        async () =>
          (await ds.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND state LIKE 'idle in transaction%'`))[0].n,
        { timeout: 10_000 },
      )
      .toBe(0);
    expect(await ds.query(`SELECT count(*)::int AS n FROM intakes`)).toEqual(before);
    // And the next upload goes through.
    expect((await rawPost(api.baseUrl, path, hyg, MULTIPART, multipartBody(roster()))).status).toBe(201);
  });
});
