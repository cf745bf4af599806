// Parses PDF signature containers in a worker thread, never on the server's main thread: a hostile
// container cannot block the event loop (/api/health and every other request keep being answered).
// The container is located and walked on the main thread first (locateSignature: size and element
// caps, no objects built); only what passes goes to the worker, which has a time budget per parse
// and a heap limit. A parse beyond either is refused as too complex and the worker replaced.
import path from 'node:path';
import { LimitedWorker } from '@/lib/calc/sandbox/limited-worker';
import { AppError } from '@/lib/errors/app-error';
import { config } from '@/lib/config';
import {
  CONTAINER_TOO_COMPLEX,
  locateSignature,
  signedRangesDigest,
  type PdfSignatureCheck,
  type SignedDataCheck,
} from './cades';

export interface ParseRequest {
  id: number;
  der: Uint8Array;
  digest: Uint8Array;
}

export type ParseReply = { type: 'ready' } | { type: 'done'; id: number; check: SignedDataCheck };

export interface SignatureParserOptions {
  /** Time budget of one parse in the worker, in ms. */
  timeoutMs: number;
  /** Old-generation heap limit of the worker, in MB. */
  memoryMb: number;
  /** Parses that may wait for the worker; beyond, 503. */
  maxQueued: number;
  /** The project root (where lib/ is); defaults to the current directory. */
  root?: string;
}

function signatureParserOptionsFromEnv(): SignatureParserOptions {
  return {
    timeoutMs: config().WORLDSHEET_SIGNATURE_PARSE_TIMEOUT_MS,
    memoryMb: config().WORLDSHEET_SIGNATURE_PARSE_MEMORY_MB,
    maxQueued: 16,
  };
}

const WORKER_ENTRY = ['lib', 'issue', 'signature-worker-entry.mjs'].join(path.sep);

class ParseBudgetExceeded extends Error {}

interface Job {
  request: ParseRequest;
  resolve: (check: SignedDataCheck) => void;
  reject: (error: Error) => void;
}

export class SignatureParser {
  private readonly thread: LimitedWorker<ParseReply>;
  private readonly queue: Job[] = [];
  private current: { job: Job; timer: NodeJS.Timeout } | null = null;
  private busy = false;
  private nextId = 1;
  /** Containers parsed by the worker thread (for tests: the main thread parses none). */
  parsed = 0;

  constructor(readonly options: SignatureParserOptions) {
    this.thread = new LimitedWorker<ParseReply>({
      entry: WORKER_ENTRY,
      root: options.root,
      memoryMb: options.memoryMb,
      youngMb: Math.max(4, Math.min(16, options.memoryMb / 4)),
      label: 'signature worker',
      onMessage: (m) => this.onReply(m),
      // Out of memory (ERR_WORKER_OUT_OF_MEMORY) or any other end of the thread mid-parse.
      onCrash: (error) => this.fail(new ParseBudgetExceeded(error.message)),
    });
  }

  /** Parses and checks a container (within the budget of checkDerBudget) against the digest of the signed ranges. */
  parse(der: Uint8Array, digest: Uint8Array): Promise<SignedDataCheck> {
    if (this.queue.length >= this.options.maxQueued) {
      return Promise.reject(
        new AppError('unavailable', 'The server is verifying many signatures just now; try again in a minute.'),
      );
    }
    return new Promise((resolve, reject) => {
      this.queue.push({
        request: { id: this.nextId++, der: Uint8Array.from(der), digest: Uint8Array.from(digest) },
        resolve,
        reject,
      });
      void this.next();
    });
  }

  private async next(): Promise<void> {
    if (this.busy || this.queue.length === 0) return;
    this.busy = true;
    const job = this.queue.shift()!;
    try {
      await this.thread.start();
    } catch (error) {
      this.reset();
      this.busy = false;
      job.reject(error as Error);
      void this.next();
      return;
    }
    const timer = setTimeout(() => this.fail(new ParseBudgetExceeded('time')), this.options.timeoutMs);
    this.current = { job, timer };
    this.thread.post(job.request);
  }

  private onReply(m: ParseReply): void {
    if (m.type === 'ready' || !this.current || m.id !== this.current.job.request.id) return;
    const { job, timer } = this.current;
    clearTimeout(timer);
    this.current = null;
    this.busy = false;
    this.parsed++;
    job.resolve(m.check);
    if (this.queue.length === 0) this.thread.idle();
    void this.next();
  }

  private fail(error: Error): void {
    const current = this.current;
    this.current = null;
    this.busy = false;
    this.reset();
    if (current) {
      clearTimeout(current.timer);
      current.job.reject(error);
    }
    void this.next();
  }

  private reset(): void {
    this.thread.reset();
  }

  close(): Promise<void> {
    return this.thread.close();
  }

  /**
   * Checks the last embedded signature of a PDF as verifyPdfSignature does, with the container
   * parsed in the worker. A container beyond the budget, or whose parse exceeds the worker's time
   * or memory, comes back with `refused` set and is never parsed on this thread.
   */
  async verifyPdf(pdf: Buffer): Promise<PdfSignatureCheck> {
    const located = locateSignature(pdf);
    if (!located.ok) return located.check;
    const where = { coversWholeFile: located.coversWholeFile, subFilter: located.subFilter };
    try {
      const checked = await this.parse(located.der, signedRangesDigest(pdf, located.ranges));
      return { ...checked, ...where, refused: null };
    } catch (error) {
      if (!(error instanceof ParseBudgetExceeded)) throw error;
      return {
        valid: false,
        signerName: null,
        signerOrganisation: null,
        certificateSha256: null,
        problem: CONTAINER_TOO_COMPLEX,
        refused: 'too-complex',
        ...where,
      };
    }
  }
}

const globalForParser = globalThis as unknown as { worldsheetSignatureParser?: SignatureParser };

/** The server's signature parser. */
export function getSignatureParser(): SignatureParser {
  globalForParser.worldsheetSignatureParser ??= new SignatureParser(signatureParserOptionsFromEnv());
  return globalForParser.worldsheetSignatureParser;
}
