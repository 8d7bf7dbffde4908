#!/usr/bin/env node
// Runs the TypeScript sources through tsx, so `npx slotwright` works right after `npm ci`.
import { register } from 'tsx/esm/api';

register();
const { runCli } = await import('../src/cli/main.ts');
process.exitCode = await runCli(process.argv.slice(2));
