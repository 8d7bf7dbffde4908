// Dispatches `npm run bench -- <name> [args]` to bench/<name>.ts, which exports `run(args)`.
const BENCHES = ['solver', 'feeds', 'meet', 'week'] as const;

const [name, ...args] = process.argv.slice(2);
if (name === undefined || !(BENCHES as readonly string[]).includes(name)) {
  process.stderr.write(`usage: npm run bench -- <${BENCHES.join('|')}> [options]\n`);
  process.exit(2);
}
const mod = (await import(`./${name}.ts`)) as { run(args: readonly string[]): Promise<number> };
process.exitCode = await mod.run(args);
