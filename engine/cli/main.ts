#!/usr/bin/env node
/** The `wellsmith` executable: runs the command line and prints its outcome. */
import { hideBin } from 'yargs/helpers';
import { cli } from './app.js';
import { closePool } from '../pool.js';

const outcome = await cli(hideBin(process.argv));
// Stopping the worker threads here is faster than leaving them to the exit path.
await closePool();
process.stdout.write(outcome.stdout);
process.stderr.write(outcome.stderr);
process.exitCode = outcome.code;
