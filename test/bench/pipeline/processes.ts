/** Child processes of the pipeline benchmark, each `node --import tsx FILE ARGS…` from the project root. */
import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { createInterface } from 'node:readline';
import { projectRoot } from '../../../server/project-root.js';

/**
 * BENCH_CPU_PROFILE_DIR=DIR writes V8 CPU profiles of the server process (one per thread:
 * event loop, storage worker, prediction worker) into DIR, for Chromium's DevTools.
 */
function profileArgs(file: string): string[] {
  const dir = process.env.BENCH_CPU_PROFILE_DIR;
  return dir && file === 'bench-server.ts' ? ['--cpu-prof', `--cpu-prof-dir=${path.resolve(dir)}`] : [];
}

/** With `stdin: 'pipe'` the child can be told when to go (a line on its standard input). */
export function startChild(file: string, args: string[], stdin: 'ignore' | 'pipe' = 'ignore'): ChildProcess {
  return spawn(process.execPath, [...profileArgs(file), '--import', 'tsx', path.join('test', 'bench', 'pipeline', file), ...args], {
    cwd: projectRoot(),
    stdio: [stdin, 'pipe', 'inherit'],
  });
}

/** The first line the child prints (rejects if it exits first or stays silent for `timeoutMs`). */
export function firstLine(child: ChildProcess, timeoutMs = 120_000): Promise<string> {
  return new Promise((resolve, reject) => {
    const lines = createInterface({ input: child.stdout! });
    const timer = setTimeout(() => reject(new Error(`no answer from ${child.spawnfile} within ${timeoutMs / 1000} s`)), timeoutMs);
    lines.once('line', (line) => {
      clearTimeout(timer);
      resolve(line);
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`child exited (${code}) before answering`));
    });
  });
}

/** Sends SIGTERM and waits for the exit (SIGKILL after `graceMs`). */
export async function stopChild(child: ChildProcess, graceMs = 30_000): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = once(child, 'exit');
  child.kill('SIGTERM');
  const timer = setTimeout(() => child.kill('SIGKILL'), graceMs);
  await exited;
  clearTimeout(timer);
}

/** CPU time (user + system) of process `pid` so far, s (Linux /proc; 100 ticks per second assumed). */
export function cpuSeconds(pid: number): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    return Number.NaN;
  }
}
