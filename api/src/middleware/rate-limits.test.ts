import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { intakeRateLimit } from './rate-limits';

describe('intake rate limit', () => {
  it('answers 429 with a problem body past the limit, and never limits reads (common practice: RFC 6585)', async () => {
    const app = express();
    app.use(intakeRateLimit(2));
    app.all('/', (_req, res) => res.json({ ok: true }));
    await request(app).post('/').expect(200);
    await request(app).post('/').expect(200);
    const limited = await request(app).post('/').expect(429);
    expect(limited.body).toEqual({ code: 'rate_limited', message: expect.stringMatching(/too many/) });
    await request(app).get('/').expect(200);
  });
});
