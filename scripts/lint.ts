// `npm run lint`: the house rules (DEVELOPERS.md "House rules"): ESLint (layering, type imports, declared
// dependencies, Vue), Prettier and knip (unused files, exports, dependencies). The three read the tree independently,
// so they run side by side; each keeps a cache under node_modules/.cache so a second run only reads what changed.
// Exit 0 when all three pass; otherwise each failing tool's own report is printed.
import { spawn } from 'node:child_process';

type Tool = { name: string; command: string; args: string[] };

const TOOLS: Tool[] = [
  { name: 'eslint', command: 'eslint', args: ['.', '--cache', '--cache-location', 'node_modules/.cache/eslint/', '--max-warnings', '0'] },
  { name: 'prettier', command: 'prettier', args: ['--check', '.', '--cache', '--log-level', 'warn'] },
  { name: 'knip', command: 'knip', args: ['--no-progress'] },
];

function run(tool: Tool): Promise<{ tool: Tool; code: number; output: string; seconds: number }> {
  const started = Date.now();
  return new Promise((resolve) => {
    const child = spawn('npx', ['--no-install', tool.command, ...tool.args], { stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.on('close', (code) => resolve({ tool, code: code ?? 1, output, seconds: (Date.now() - started) / 1000 }));
  });
}

const results = await Promise.all(TOOLS.map(run));
for (const { tool, code, output, seconds } of results) {
  console.log(`${code === 0 ? 'ok  ' : 'FAIL'} ${tool.name} (${seconds.toFixed(1)} s)`);
  if (code !== 0) console.log(output.trimEnd() + '\n');
}
process.exit(results.every((r) => r.code === 0) ? 0 : 1);
