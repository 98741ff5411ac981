// Entry of the worker thread that runs the transfer-matrix kernel for `localis tmm`. Plain
// JavaScript for the reason bin/localis.mjs is: on Node 20 a worker does not inherit the main
// thread's tsx loader, so it registers its own before loading the TypeScript.
import { register } from 'tsx/esm/api';

register();
await import('./tmm-worker.ts');
