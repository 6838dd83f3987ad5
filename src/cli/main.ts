#!/usr/bin/env node
/** holdfast command-line entry point: binds `runCli` to the process and nothing else. */
import { processIo } from './io.js';
import { runCli } from './program.js';

process.exitCode = await runCli(process.argv.slice(2), processIo());
