#!/usr/bin/env node
// Command-line entry point. Runs the prebuilt bundle (out/main/cli, `npm run build:cli`) when it exists
// and is not older than any source it was built from; otherwise, or with SLACKLINE_FROM_SOURCE=1, loads
// the TypeScript sources through tsx so the checkout runs as is.
import { readFileSync, statSync } from 'node:fs';

const root = new URL('../', import.meta.url);
const bundle = new URL('out/main/cli/index.js', root);

/** True when the bundle exists and none of the sources listed in its inputs.json changed since the build. */
function bundleIsFresh() {
  if (process.env.SLACKLINE_FROM_SOURCE === '1') return false;
  try {
    const { builtAt, inputs } = JSON.parse(readFileSync(new URL('out/main/cli/inputs.json', root), 'utf8'));
    statSync(bundle);
    return inputs.every((file) => statSync(new URL(file, root)).mtimeMs <= builtAt);
  } catch {
    return false; // no bundle, or a source it lists is gone: run from source
  }
}

let main;
if (bundleIsFresh()) {
  ({ main } = await import(bundle.href));
} else {
  const { register } = await import('tsx/esm/api');
  register();
  ({ main } = await import('../main/cli/index.ts'));
}
process.exitCode = await main(process.argv.slice(2));
