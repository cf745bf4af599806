// oidc-provider ships no type definitions; this declares the little of it that
// tests/support/identity-provider.ts uses.
declare module 'oidc-provider' {
  import type { IncomingMessage, ServerResponse } from 'node:http';

  export interface AccountClaims {
    sub: string;
    [claim: string]: unknown;
  }

  export interface Account {
    accountId: string;
    claims(use: string, scope: string): AccountClaims | Promise<AccountClaims>;
  }

  export interface Configuration {
    findAccount?(ctx: unknown, sub: string): Account | undefined | Promise<Account | undefined>;
    [option: string]: unknown;
  }

  export default class Provider {
    constructor(issuer: string, configuration?: Configuration);
    /** Whether to trust X-Forwarded-* headers (koa's app.proxy). */
    proxy: boolean;
    readonly issuer: string;
    callback(): (req: IncomingMessage, res: ServerResponse) => void;
    on(event: string, listener: (...args: unknown[]) => void): this;
  }
}
