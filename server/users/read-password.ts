import { stdin, stdout } from 'node:process';

/**
 * A password for a command-line tool: on a terminal it is prompted twice without echo (both
 * must match); otherwise it is the first line of standard input (without its line ending).
 */
export async function readPassword(prompt: string, repeatPrompt: string): Promise<string> {
  if (!stdin.isTTY) return firstLine();
  const first = await promptHidden(prompt);
  const second = await promptHidden(repeatPrompt);
  if (first !== second) throw new Error('the two passwords differ; nothing was changed');
  return first;
}

async function firstLine(): Promise<string> {
  let text = '';
  for await (const chunk of stdin) {
    text += String(chunk);
    if (text.includes('\n')) break;
  }
  stdin.destroy();
  const line = text.split('\n')[0].replace(/\r$/, '');
  if (line === '') throw new Error('no password on standard input: pipe it in as the first line, or run the command on a terminal');
  return line;
}

function promptHidden(prompt: string): Promise<string> {
  return new Promise((resolve, reject) => {
    stdout.write(prompt);
    stdin.setRawMode(true);
    stdin.resume();
    stdin.setEncoding('utf8');
    let typed = '';
    const done = (error: Error | null) => {
      stdin.off('data', onData);
      stdin.setRawMode(false);
      stdin.pause();
      stdout.write('\n');
      if (error) reject(error);
      else resolve(typed);
    };
    const onData = (chunk: string) => {
      for (const ch of chunk) {
        if (ch === '\r' || ch === '\n') return done(null);
        if (ch === '\u0003') return done(new Error('cancelled; nothing was changed'));
        if (ch === '\u007f' || ch === '\b') typed = typed.slice(0, -1);
        else typed += ch;
      }
    };
    stdin.on('data', onData);
  });
}
