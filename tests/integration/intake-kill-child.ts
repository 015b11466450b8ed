// Child process of intake-versions.test.ts: starts a large roster intake (check and apply) from a
// slow generated stream, says when COPY is under way, and waits to be killed mid-COPY.
import { Readable } from 'node:stream';
import { createDataSource } from '@ratewarden/db';
import { receiveIntake } from '@ratewarden/api/features/intake/intake-receive';
import type { Principal } from '@ratewarden/shared/permissions';

const [url, site, group, prefix, principalJson] = process.argv.slice(2) as [string, string, string, string, string];
const ds = createDataSource(`${url}?application_name=intake-kill-child`, 2);
await ds.initialize();
let n = 0;
const stream = new Readable({
  read() {
    if (n === 0) this.push('worker_key,site,exposure_group,month,hours,birth_year,sex\n');
    let chunk = '';
    for (let i = 0; i < 500; i++, n++) chunk += `${prefix}${n},${site},${group},2019-${String((n % 12) + 1).padStart(2, '0')},100,1980,F\n`;
    if (n === 5000) process.stdout.write('copying\n');
    setTimeout(() => this.push(chunk), 5);
  },
});
await receiveIntake(ds, { kind: 'roster', mode: 'apply', fileName: 'killed.csv', stream, principal: JSON.parse(principalJson) as Principal });
