// Entry of the worker thread that runs the transfer-matrix kernel (`localis tmm`, the worker's
// spot-checks). Plain JavaScript: on Node 20 a worker thread does not inherit the main thread's
// tsx loader, so it registers its own before loading the TypeScript.
import { register } from 'tsx/esm/api';

register();
await import('./kernel-thread-body.ts');
