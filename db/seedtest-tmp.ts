import { createDataSource, migrate, seedDemo } from '@ratewarden/db';
const url = process.env.U!;
await migrate(url);
const ds = createDataSource(url, 2); await ds.initialize();
const t = Date.now();
console.log(await seedDemo(ds), (Date.now() - t) / 1000, 's');
console.log(await ds.query(`SELECT count(*) rows, count(DISTINCT worker_id) workers, round(sum(hours)/1800,1) py FROM roster_entries`));
console.log(await ds.query(`SELECT o.code, g.code grp, count(*) n, round(100.0*count(*)/ (SELECT sum(hours)/1800 FROM roster_entries re2 WHERE re2.exposure_group_id = g.id),2) per100py FROM case_events ce JOIN outcomes o ON o.id = ce.outcome_id JOIN roster_entries re ON re.worker_id = ce.worker_id AND re.month = date_trunc('month', ce.onset_date) JOIN exposure_groups g ON g.id = re.exposure_group_id WHERE ce.status <> 'ruled_out' GROUP BY 1,2, g.id ORDER BY 1,2`));
await ds.destroy();
