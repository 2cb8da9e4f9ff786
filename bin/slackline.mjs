#!/usr/bin/env node
// Command-line entry point. Loads the TypeScript sources through tsx so the checkout runs as is.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../main/cli/index.ts');
process.exitCode = await main(process.argv.slice(2));
