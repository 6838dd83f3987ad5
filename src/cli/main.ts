#!/usr/bin/env node
/** holdfast command-line entry point: parses arguments and calls one function per command. */
console.log('holdfast: under construction');
