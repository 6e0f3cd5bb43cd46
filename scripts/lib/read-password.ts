/**
 * Reading a password in a command-line tool without putting it in the process list or the
 * shell's history: asked for in a terminal with no echo, or one line from standard input.
 */
import { passwordProblem } from '../../src/lib/server/password-policy.ts';
import type { ReadStream } from 'node:tty';

/** The first line of `input` (up to the first new line or the end), without its \r\n. */
export async function readFirstLine(input: NodeJS.ReadableStream): Promise<string> {
  let text = '';
  for await (const chunk of input) {
    text += typeof chunk === 'string' ? chunk : (chunk as Buffer).toString('utf8');
    if (text.includes('\n')) break;
  }
  const line = text.split('\n', 1)[0] ?? '';
  return line.endsWith('\r') ? line.slice(0, -1) : line;
}

/** Asks on the terminal with nothing shown as it is typed; Ctrl-C ends the program. */
export function askHidden(question: string, input: ReadStream = process.stdin as ReadStream): Promise<string> {
  process.stderr.write(question);
  input.setRawMode(true);
  input.setEncoding('utf8');
  input.resume();
  return new Promise((resolve) => {
    let value = '';
    const finish = () => {
      input.off('data', onData);
      input.setRawMode(false);
      input.pause();
      process.stderr.write('\n');
    };
    const onData = (chunk: string) => {
      for (const ch of chunk) {
        if (ch === '\r' || ch === '\n' || ch === '\u0004') {
          finish();
          resolve(value);
          return;
        }
        if (ch === '\u0003') {
          finish();
          process.exit(130);
        }
        if (ch === '\u007f' || ch === '\b') value = [...value].slice(0, -1).join('');
        else if (ch >= ' ') value += ch; // other control characters are dropped
      }
    };
    input.on('data', onData);
  });
}

/**
 * A new password from wherever the command was given it: --password (scripts only),
 * --password-stdin (one line), or asked twice, not shown, in a terminal. Refused early, with
 * the policy's own words, so nobody types it twice in vain.
 */
export async function passwordFrom(
  given: { password?: string; stdin?: boolean },
  fail: (message: string) => never,
  nothingDone: string,
): Promise<string> {
  if (given.password !== undefined && given.stdin) fail('use --password-stdin or --password, not both');
  let value = given.password;
  if (given.stdin) {
    value = await readFirstLine(process.stdin);
    if (!value) fail('no password on standard input (one line is read)');
  }
  if (value !== undefined) {
    const problem = passwordProblem(value);
    return problem ? fail(problem) : value;
  }
  if (!process.stdin.isTTY)
    fail('no password: run it in a terminal to be asked, or give one line on standard input with --password-stdin');
  const first = await askHidden('Password: ');
  const problem = passwordProblem(first);
  if (problem) fail(problem);
  if ((await askHidden('Same password again: ')) !== first) fail(`the two passwords differ; ${nothingDone}`);
  return first;
}
