#!/usr/bin/env node
/** The `wellsmith` executable: runs the command line and prints its outcome. */
import { hideBin } from 'yargs/helpers';
import { cli } from './app.js';

const outcome = await cli(hideBin(process.argv));
process.stdout.write(outcome.stdout);
process.stderr.write(outcome.stderr);
process.exitCode = outcome.code;
