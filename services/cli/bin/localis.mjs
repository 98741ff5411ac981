#!/usr/bin/env node
// The CLI runs straight from its TypeScript sources, like the api and the worker, so there is no
// build step to forget after `git pull` on a login node. tsx's loader is registered here, in plain
// JavaScript, because Node cannot load the .ts entry point before a loader exists.
import { register } from 'tsx/esm/api';

register();
await import('../src/main.ts');
