// The intake process of `npm run bench`: the real intake router on a loopback port, with an
// integration-client principal set in front of it (sign-in is not what is being measured).
// Prints its port, then its peak resident memory when asked on GET /rss.
import express from 'express';
import { createDataSource } from '@ratewarden/db';
import { intakeRouter } from '@ratewarden/api/features/intake/intake-routes';
import { errorHandler } from '@ratewarden/api/middleware/error-handler';

const ds = createDataSource(process.argv[2], 4);
await ds.initialize();
const app = express();
app.use((req, _res, next) => {
  req.principal = { kind: 'client', clientId: 'bench' };
  next();
});
app.get('/rss', (_req, res) => {
  res.json({ peakRssMb: process.resourceUsage().maxRSS / 1024 });
});
app.use('/api/intakes', intakeRouter({ dataSource: ds }));
app.use(errorHandler);
const server = app.listen(0, '127.0.0.1', () => {
  const addr = server.address();
  process.stdout.write(`port ${typeof addr === 'object' && addr ? addr.port : 0}\n`);
});
