// The OpenAPI document: one operation for every route handler on disk and none for a route that does
// not exist, structurally valid OpenAPI 3.1, and generated from the zod schemas the handlers use.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { z, type ZodType } from 'zod';
import { GET } from '../../app/api/openapi.json/route';
import * as auditQuery from '../../lib/audit/query';
import * as account from '../../lib/auth/account';
import * as lockout from '../../lib/auth/lockout';
import * as apiTokens from '../../lib/auth/api-tokens';
import * as evaluateRequest from '../../lib/calc/evaluate-request';
import * as sheetFile from '../../lib/calc/sheet-file';
import { buildOpenApiDocument, OPERATIONS } from '../../lib/http/openapi';
import * as cspReports from '../../lib/http/csp-reports';
import * as openApiSchemas from '../../lib/http/openapi-schemas';
import * as projects from '../../lib/projects/projects';
import * as users from '../../lib/projects/users';
import * as compare from '../../lib/sheets/compare';
import * as sheetFiles from '../../lib/sheets/sheet-files';
import * as sheets from '../../lib/sheets/sheets';
import * as softwareImpact from '../../lib/sheets/software-impact';
import * as voiding from '../../lib/sheets/void';
import * as startFrom from '../../lib/sheets/start-from';
import * as checksWorkflow from '../../lib/checks/workflow';
import * as issueDownload from '../../lib/issue/download';
import * as issueRegister from '../../lib/issue/register';
import * as issueRequest from '../../lib/issue/request';
import * as issueVerification from '../../lib/issue/verification';
import * as issueWithdraw from '../../lib/issue/withdraw';

const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

interface RouteFile {
  /** "GET /api/sheets/{sheetId}/versions" */
  key: string;
  file: string;
}

function routeFiles(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) routeFiles(p, out);
    else if (name === 'route.ts') out.push(p);
  }
  return out;
}

/** The folder path as an OpenAPI path: route groups dropped, `[id]`, `[...rest]` and `[[...rest]]` as `{id}`, `{rest}`. */
function openApiPath(appDir: string, file: string): string {
  const segments = path
    .relative(appDir, path.dirname(file))
    .split(path.sep)
    .filter((s) => !/^\(.*\)$/.test(s))
    .map((s) => s.replace(/^\[\[?(?:\.\.\.)?([^\]]+)\]?\]$/, '{$1}'));
  return `/${segments.join('/')}`;
}

/** The HTTP methods a route file exports, in each form Next.js accepts. */
function exportedMethods(source: string): string[] {
  const methods = new Set<string>();
  const isMethod = (name: string) => (METHODS as readonly string[]).includes(name);
  for (const m of source.matchAll(/export\s+(?:async\s+)?function\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]);
  for (const m of source.matchAll(/export\s+(?:const|let|var)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]);
  // export const { GET, POST } = handlers;
  for (const m of source.matchAll(/export\s+const\s*\{([^}]*)\}/g)) {
    for (const part of m[1].split(',')) {
      const name = part.split(':').pop()!.trim();
      if (isMethod(name)) methods.add(name);
    }
  }
  // export { handler as GET, handler as POST };  export { GET } from '…';
  for (const m of source.matchAll(/export\s*\{([^}]*)\}/g)) {
    for (const part of m[1].split(',')) {
      const name = part.trim().split(/\s+/).pop()!;
      if (isMethod(name)) methods.add(name);
    }
  }
  return [...methods];
}

function routesOnDisk(): RouteFile[] {
  const appDir = path.join(process.cwd(), 'app');
  const out: RouteFile[] = [];
  for (const file of routeFiles(path.join(appDir, 'api'))) {
    for (const method of exportedMethods(readFileSync(file, 'utf8')))
      out.push({ key: `${method} ${openApiPath(appDir, file)}`, file });
  }
  return out.sort((a, b) => a.key.localeCompare(b.key));
}

type Doc = {
  openapi: string;
  info: { title: string; version: string };
  paths: Record<
    string,
    Record<
      string,
      {
        operationId: string;
        security?: Record<string, string[]>[];
        parameters?: Array<{ name: string; in: string; required?: boolean; schema: unknown }>;
        requestBody?: { content: Record<string, { schema: unknown }> };
        responses: Record<string, { description?: string; content?: Record<string, { schema: unknown }> }>;
      }
    >
  >;
  components: { schemas: Record<string, unknown>; securitySchemes: Record<string, unknown> };
};

const doc = buildOpenApiDocument() as Doc;

function operationsInDocument(): { key: string; path: string; method: string; op: Doc['paths'][string][string] }[] {
  return Object.entries(doc.paths).flatMap(([p, item]) =>
    Object.entries(item).map(([method, op]) => ({ key: `${method.toUpperCase()} ${p}`, path: p, method, op })),
  );
}

/** Request schemas as z.toJSONSchema writes them for the request side, without the `$schema` keyword. */
function requestJsonSchema(schema: ZodType): Record<string, unknown> {
  const { $schema: _dialect, ...rest } = z.toJSONSchema(schema, { target: 'draft-2020-12', io: 'input' });
  return rest;
}

describe('coverage of the route handlers', () => {
  it('finds the methods in each export form a route file uses', () => {
    expect(exportedMethods('export function GET() {}\nexport async function POST() {}')).toEqual(['GET', 'POST']);
    expect(
      exportedMethods('const handler = NextAuth(authOptions);\nexport { handler as GET, handler as POST };'),
    ).toEqual(['GET', 'POST']);
    expect(exportedMethods('export const { GET, POST } = handlers;')).toEqual(['GET', 'POST']);
    expect(openApiPath('/x/app', '/x/app/api/auth/[...nextauth]/route.ts')).toBe('/api/auth/{nextauth}');
    expect(openApiPath('/x/app', '/x/app/api/sheets/[sheetId]/versions/[number]/route.ts')).toBe(
      '/api/sheets/{sheetId}/versions/{number}',
    );
  });

  it('documents every method of every route file under app/api', () => {
    const documented = new Set(operationsInDocument().map((o) => o.key));
    const onDisk = routesOnDisk();
    expect(onDisk.length).toBeGreaterThan(20);
    expect(onDisk.filter((r) => !documented.has(r.key)).map((r) => r.key)).toEqual([]);
  });

  it('documents no operation whose route file or method does not exist', () => {
    const onDisk = new Set(routesOnDisk().map((r) => r.key));
    expect(
      operationsInDocument()
        .filter((o) => !onDisk.has(o.key))
        .map((o) => o.key),
    ).toEqual([]);
  });
});

describe('the document is OpenAPI 3.1', () => {
  const operations = operationsInDocument();

  it('declares its version, title and version of the API', () => {
    // OpenAPI Specification 3.1.0, OpenAPI Object: `openapi` and `info` (with `title` and `version`) are REQUIRED.
    expect(doc.openapi).toBe('3.1.0');
    expect(doc.info.title).toBe('Worldsheet API');
    expect(typeof doc.info.version).toBe('string');
    expect(doc.info.version.length).toBeGreaterThan(0);
    // OpenAPI Specification 3.1.0, Paths Object: "The field name MUST begin with a forward slash".
    for (const p of Object.keys(doc.paths)) expect(p).toMatch(/^\//);
  });

  it('gives every operation responses, each with a description', () => {
    // OpenAPI Specification 3.1.0, Operation Object (`responses`) and Response Object (`description` REQUIRED).
    for (const { key, op } of operations) {
      expect(Object.keys(op.responses).length, key).toBeGreaterThan(0);
      for (const [status, r] of Object.entries(op.responses)) {
        expect(status, key).toMatch(/^[1-5]\d\d$/);
        expect(typeof r.description, `${key} ${status}`).toBe('string');
      }
    }
  });

  it('declares each path template parameter as a required path parameter, and no other', () => {
    // OpenAPI Specification 3.1.0, Path Templating, and Parameter Object: "If the parameter location is
    // "path", this property is REQUIRED and its value MUST be true."
    for (const { key, path: p, op } of operations) {
      const inTemplate = [...p.matchAll(/\{([^}]+)\}/g)].map((m) => m[1]).sort();
      const declared = (op.parameters ?? []).filter((q) => q.in === 'path');
      expect(declared.map((q) => q.name).sort(), key).toEqual(inTemplate);
      for (const q of declared) expect(q.required, `${key} {${q.name}}`).toBe(true);
      // OpenAPI Specification 3.1.0, Operation Object: parameters are unique by name and location.
      const ids = (op.parameters ?? []).map((q) => `${q.in}:${q.name}`);
      expect(new Set(ids).size, key).toBe(ids.length);
    }
  });

  it('has unique operationIds', () => {
    // OpenAPI Specification 3.1.0, Operation Object: "The id MUST be unique among all operations described in the API."
    const ids = operations.map((o) => o.op.operationId);
    expect(ids.every((id) => typeof id === 'string' && id.length > 0)).toBe(true);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('names only declared security schemes and resolvable components', () => {
    // OpenAPI Specification 3.1.0, Security Requirement Object: each name MUST correspond to a declared security scheme.
    for (const { key, op } of operations) {
      for (const requirement of op.security ?? [])
        for (const name of Object.keys(requirement)) expect(doc.components.securitySchemes, key).toHaveProperty(name);
    }
    const refs = [...JSON.stringify(doc).matchAll(/"\$ref":"#\/components\/schemas\/([^"]+)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(0);
    for (const name of refs) expect(doc.components.schemas).toHaveProperty(name);
  });
});

describe("generated from the handlers' zod schemas", () => {
  it('shows the body of POST /api/sheets/{sheetId}/versions as z.toJSONSchema of saveVersionSchema', () => {
    const schema = doc.paths['/api/sheets/{sheetId}/versions'].post.requestBody!.content['application/json'].schema;
    expect(schema).toEqual(requestJsonSchema(sheets.saveVersionSchema));
    expect(schema).toMatchObject({ required: expect.arrayContaining(['parentNumber', 'message', 'content']) });
  });

  it('shows the query of GET /api/projects/{projectId}/audit as the properties of auditQuerySchema', () => {
    const query = requestJsonSchema(auditQuery.auditQuerySchema) as { properties: Record<string, unknown> };
    const params = doc.paths['/api/projects/{projectId}/audit'].get.parameters!.filter((p) => p.in === 'query');
    expect(Object.fromEntries(params.map((p) => [p.name, p.schema]))).toEqual(query.properties);
  });

  it('uses, for each body and query, a schema exported from lib/ under a name the route file uses', () => {
    const modules: Record<string, Record<string, unknown>> = {
      'lib/audit/query.ts': auditQuery,
      'lib/auth/account.ts': account,
      'lib/auth/api-tokens.ts': apiTokens,
      'lib/auth/lockout.ts': lockout,
      'lib/calc/evaluate-request.ts': evaluateRequest,
      'lib/calc/sheet-file.ts': sheetFile,
      'lib/projects/projects.ts': projects,
      'lib/projects/users.ts': users,
      'lib/sheets/compare.ts': compare,
      'lib/sheets/sheet-files.ts': sheetFiles,
      'lib/sheets/sheets.ts': sheets,
      'lib/sheets/software-impact.ts': softwareImpact,
      'lib/sheets/void.ts': voiding,
      'lib/sheets/start-from.ts': startFrom,
      'lib/checks/workflow.ts': checksWorkflow,
      'lib/issue/request.ts': issueRequest,
      'lib/issue/register.ts': issueRegister,
      'lib/issue/download.ts': issueDownload,
      'lib/issue/withdraw.ts': issueWithdraw,
      'lib/issue/verification.ts': issueVerification,
      'lib/http/csp-reports.ts': cspReports,
    };
    // The import route hands the body text to importSheetFile, which parses it with sheetFileSchema.
    // The CSP report route hands the body to parseCspReports, which checks it with cspReportBodySchema.
    // (The import preview reads the body the same way.) A query is parsed in the route file itself.
    const parsedInLib: Record<string, string> = {
      'POST /api/projects/{projectId}/sheets/import': 'lib/calc/sheet-file.ts',
      'POST /api/projects/{projectId}/sheets/import/preview': 'lib/calc/sheet-file.ts',
      'POST /api/csp-report': 'lib/http/csp-reports.ts',
    };
    const files = new Map(routesOnDisk().map((r) => [r.key, r.file]));
    const describedOnly = new Set<unknown>(Object.values(openApiSchemas));
    let checked = 0;
    for (const op of OPERATIONS) {
      const key = `${op.method} ${op.path}`;
      for (const schema of [op.body?.schema, op.query]) {
        if (!schema || schema === 'binary') continue;
        if (describedOnly.has(schema)) {
          // Only forms that no zod schema parses (multipart uploads, next-auth's sign-in form) may be described in the document alone.
          expect(schema, key).toBe(op.body?.schema);
          expect(op.body?.contentType, key).toMatch(/^(multipart\/form-data|application\/x-www-form-urlencoded)$/);
          continue;
        }
        const owner = Object.entries(modules).flatMap(([file, mod]) =>
          Object.entries(mod)
            .filter(([, v]) => v === schema)
            .map(([name]) => ({ file, name })),
        )[0];
        expect(owner, `${key}: its schema is not exported from lib/`).toBeDefined();
        const user = (schema === op.body?.schema ? parsedInLib[key] : undefined) ?? files.get(key);
        if (!user) continue; // a route not on disk yet: the coverage test reports it
        expect(readFileSync(path.resolve(process.cwd(), user), 'utf8'), `${key} should use ${owner!.name}`).toContain(
          owner!.name,
        );
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThan(15);
  });
});

describe('GET /api/openapi.json', () => {
  it('answers 200 with the document as JSON', async () => {
    const response = GET();
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toMatch(/^application\/json/);
    const body = await response.json();
    expect(body.openapi).toBe('3.1.0');
    expect(body).toEqual(JSON.parse(JSON.stringify(buildOpenApiDocument())));
  });
});
