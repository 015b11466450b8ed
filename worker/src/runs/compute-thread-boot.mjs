// Entry of a compute thread (compute-pool.ts): registers tsx's loader, then loads the TypeScript
// module. A .ts file given to new Worker() directly would be loaded before any loader applies.
import { register } from 'tsx/esm/api';

register();
await import('./compute-thread.ts');
