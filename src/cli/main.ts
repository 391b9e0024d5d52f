/**
 * The `tessellab` command: dispatches to one module per sub-command. Each command returns an exit code;
 * errors reach the user as one line on stderr, never a stack trace.
 */
import { describeError } from '../core/errors';

export interface Command {
  name: string;
  summary: string;
  usage: string;
  run(args: string[]): Promise<number>;
}

const loaders: Record<string, () => Promise<Command>> = {
  analyze: async () => (await import('./commands/analyze')).command,
  // The app's buttons say "Analyse": both spellings run the same command.
  analyse: async () => (await import('./commands/analyze')).command,
  synth: async () => (await import('./commands/synth')).command,
  reference: async () => (await import('./commands/reference')).command,
  kinetics: async () => (await import('./commands/kinetics')).command,
  merge: async () => (await import('./commands/merge')).command,
};

function help(): string {
  return [
    'tessellab: measure cellular patterns in micrographs.',
    '',
    'Commands:',
    '  tessellab analyze IMAGE... [--pattern walls|bodies|points] [--um-per-px X] [--out DIR]   (or: analyse)',
    '                   [--files-from LIST|-] [--shard I/N] [--skip-existing] [--threads N] [--mask FILE.png]',
    '  tessellab merge DIR... --out FILE.csv',
    '  tessellab kinetics IMAGE... --times t1,t2,... [--out DIR]',
    '  tessellab synth --pattern walls|bodies --cells N --size WxH [--order random|regular|clustered] --seed S --out FILE',
    '  tessellab reference --cells N --size WxH [--replicates R] [--seed S]',
    '',
    'Run `tessellab COMMAND --help` for the options of one command.',
  ].join('\n');
}

export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(help() + '\n');
    return name ? 0 : 2;
  }
  const load = loaders[name];
  if (!load) {
    process.stderr.write(`tessellab: unknown command "${name}"; run \`tessellab --help\` for the list.\n`);
    return 2;
  }
  try {
    const cmd = await load();
    if (rest.includes('--help') || rest.includes('-h')) {
      process.stdout.write(`${cmd.summary}\n\nUsage: ${cmd.usage}\n`);
      return 0;
    }
    return await cmd.run(rest);
  } catch (e) {
    process.stderr.write(`tessellab ${name}: ${describeError(e)}\n`);
    if (process.env.TESSELLAB_DEBUG && e instanceof Error) process.stderr.write(`${e.stack}\n`);
    return 1;
  }
}
