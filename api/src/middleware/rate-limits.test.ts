import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { intakeRateLimit, signInRateLimit } from './rate-limits';

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

describe('sign-in rate limit', () => {
  it('counts per connection address: a made-up X-Forwarded-For is no fresh allowance without a trusted proxy', async () => {
    const app = express();
    app.use(signInRateLimit(2));
    app.get('/', (_req, res) => res.json({ ok: true }));
    await request(app).get('/').set('x-forwarded-for', '198.51.100.1').expect(200);
    await request(app).get('/').set('x-forwarded-for', '198.51.100.2').expect(200);
    const limited = await request(app).get('/').set('x-forwarded-for', '198.51.100.3').expect(429);
    expect(limited.body).toEqual({ code: 'rate_limited', message: expect.stringMatching(/sign-in/) });
  });
});
