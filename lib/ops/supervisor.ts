// Keeps track of everything a command started (child processes, the local PostgreSQL) and stops it
// all, in reverse order, on SIGINT or SIGTERM or when the command ends. Nothing is left behind.
import { spawn, type ChildProcess, type SpawnOptions } from 'node:child_process';

type Stopper = { name: string; stop: () => Promise<void> };

export class Supervisor {
  private readonly stoppers: Stopper[] = [];
  private stopping: Promise<void> | null = null;
  private readonly onSignal = (signal: NodeJS.Signals) => {
    console.log(`\n[worldsheet] ${signal}: stopping …`);
    void this.shutdown(signal === 'SIGINT' ? 130 : 143);
  };

  constructor() {
    process.on('SIGINT', this.onSignal);
    process.on('SIGTERM', this.onSignal);
    process.on('SIGHUP', this.onSignal);
    // If whatever started us dies without passing a signal on (npm killed with SIGKILL, a closed
    // terminal), we are re-parented: stop everything rather than leave servers running.
    const parent = process.ppid;
    setInterval(() => {
      if (process.ppid !== parent && !this.stopping) {
        console.log('[worldsheet] the parent process is gone: stopping …');
        void this.shutdown(1);
      }
    }, 1000).unref();
  }

  get isStopping(): boolean {
    return this.stopping !== null;
  }

  /** Registers something to stop at shutdown; the last registered stops first. */
  add(name: string, stop: () => Promise<void>): void {
    this.stoppers.push({ name, stop });
  }

  /**
   * Starts a child process that the shutdown stops with SIGTERM (then SIGKILL after a grace period).
   * With `detached`, the child leads a process group of its own, and the whole group is signalled
   * (so that what it started, such as `next build` under a build script, stops with it).
   */
  spawn(name: string, command: string, args: string[], options: SpawnOptions = {}): ChildProcess {
    const child = spawn(command, args, { stdio: 'inherit', ...options });
    const exited = new Promise<void>((resolve) => {
      if (child.exitCode !== null || child.signalCode !== null) resolve();
      else child.once('exit', () => resolve());
    });
    const signal = (s: NodeJS.Signals) => {
      if (options.detached && child.pid !== undefined) process.kill(-child.pid, s);
      else child.kill(s);
    };
    this.add(name, async () => {
      if (child.exitCode !== null || child.signalCode !== null) return;
      signal('SIGTERM');
      const timer = setTimeout(() => signal('SIGKILL'), 15_000);
      await exited;
      clearTimeout(timer);
    });
    return child;
  }

  async stopAll(): Promise<void> {
    this.stopping ??= (async () => {
      for (const s of [...this.stoppers].reverse()) {
        try {
          await s.stop();
        } catch (error) {
          console.error(`[worldsheet] could not stop ${s.name}: ${(error as Error).message}`);
        }
      }
    })();
    await this.stopping;
  }

  async shutdown(code: number): Promise<never> {
    await this.stopAll();
    process.exit(code);
  }
}

/** Resolves with the exit code when the child ends (signals count as failures). */
export function waitForExit(child: ChildProcess): Promise<number> {
  return new Promise((resolve) => {
    if (child.exitCode !== null) return resolve(child.exitCode);
    child.once('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}
