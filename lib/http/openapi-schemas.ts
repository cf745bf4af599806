// Zod schemas that exist only to describe bodies in the OpenAPI document (lib/http/openapi.ts):
// response bodies, which the handlers build from lib/ functions rather than parse, and the multipart
// upload form, which is read with request.formData(). Request bodies and queries that a handler
// validates are never described here: the document uses the handler's own schema.
// Client components parse the answers they read with these schemas (components/data/api-client.ts), so this
// module imports nothing that reaches the server (pg, kysely, Node built-ins): the lint rule worldsheet/walls
// checks that through the client.
import { z } from 'zod';
import { attachmentSchema } from '@/lib/attachments/attachment-schema';
import { calculationRecordSchema, versionContentSchema } from '@/lib/sheets/content';
import { sheetFileSchema } from '@/lib/calc/sheet-file';
import { sheetFileAttachmentSchema } from '@/lib/sheets/sheet-file-attachment';
import { PROJECT_ROLES } from '@/lib/projects/roles';

const uuid = z.uuid();
const timestamp = z.iso.datetime({ offset: true }).meta({ description: 'ISO 8601 date and time (UTC).' });
const sha256 = z
  .string()
  .regex(/^[0-9a-f]{64}$/)
  .meta({ description: 'SHA-256, lowercase hexadecimal.' });
const role = z.enum(PROJECT_ROLES);

export const okSchema = z.object({ ok: z.literal(true) });

/** 202 answers to requests that must not reveal whether an address has an account. */
export const acceptedSchema = z.object({ ok: z.literal(true), message: z.string() });

export const accountSchema = z.object({
  id: uuid,
  email: z.string(),
  name: z.string(),
  isAdmin: z.boolean(),
  via: z.enum(['session', 'token']).meta({ description: 'How this request was authenticated.' }),
});

export const apiTokenListSchema = z.object({
  tokens: z.array(
    z.object({
      id: uuid,
      name: z.string(),
      prefix: z.string(),
      scope: z
        .enum(['read', 'read-write'])
        .meta({ description: '`read`: GET and HEAD requests only; `read-write`: also changes.' }),
      created_at: timestamp,
      expires_at: timestamp.meta({ description: 'The token stops working at this time.' }),
      expired: z.boolean(),
      last_used_at: timestamp.nullable(),
      revoked_at: timestamp.nullable(),
    }),
  ),
});

export const apiTokenCreatedSchema = z.object({
  id: uuid,
  token: z.string().meta({
    description: 'The secret (`wst_…`), shown in this response only; send it as `Authorization: Bearer <token>`.',
  }),
  prefix: z.string(),
  scope: z.enum(['read', 'read-write']),
  expires_at: timestamp.meta({ description: 'When the token stops working.' }),
});

export const createdIdSchema = z.object({ id: uuid });

export const userListSchema = z.object({
  users: z.array(
    z.object({
      id: uuid,
      email: z.string(),
      name: z.string(),
      isAdmin: z.boolean(),
      disabledAt: timestamp.nullable(),
      lockedAt: timestamp.nullable().meta({ description: 'When the lock in force began; null when not locked now.' }),
      lockedUntil: timestamp.nullable().meta({
        description:
          'When a timed lock (after failed passwords) ends; null with lockedAt set: until an administrator unlocks.',
      }),
      createdAt: timestamp,
      hasPassword: z.boolean(),
    }),
  ),
});

const projectFields = {
  id: uuid,
  code: z.string(),
  name: z.string(),
  legal_owner: z.string(),
  revision_scheme: z.enum(['letters', 'numbers']),
};

export const projectListSchema = z.object({
  projects: z.array(
    z.object({
      ...projectFields,
      created_at: timestamp,
      roles: z.array(role).meta({ description: 'Roles the caller holds (administrators may hold none).' }),
    }),
  ),
});

export const projectCreatedSchema = z.object({ id: uuid, code: z.string() });

export const memberListSchema = z.object({
  members: z.array(
    z.object({
      userId: uuid,
      email: z.string(),
      name: z.string(),
      disabledAt: timestamp.nullable(),
      roles: z.array(role),
    }),
  ),
});

export const projectSchema = z.object({
  project: z.object(projectFields),
  roles: z.array(role),
  members: memberListSchema.shape.members,
});

export const auditEventListSchema = z.object({
  events: z.array(
    z.object({
      id: z.string().meta({ description: 'Sequence number of the event (a bigint, sent as a string).' }),
      occurred_at: timestamp,
      action: z.string(),
      object_type: z.string(),
      object_id: z.string().nullable(),
      old_value: z.unknown(),
      new_value: z.unknown(),
      reason: z.string().nullable(),
      session_id: z.string().nullable(),
      token_id: z.string().nullable(),
      hash: z.string(),
      actor_name: z.string().nullable(),
      actor_email: z.string().nullable(),
    }),
  ),
});

export const sheetRegisterSchema = z.object({
  sheets: z.array(
    z.object({
      id: uuid,
      number: z.number().int(),
      code: z.string().meta({ description: 'The sheet number as printed, e.g. `TPT2-CALC-0001`.' }),
      title: z.string(),
      safetyRelated: z.boolean(),
      starter: z.boolean().meta({ description: 'A starter sheet: a worked sheet offered to start new sheets from.' }),
      status: z.string(),
      currentRevision: z.string().nullable(),
      latestVersion: z.number().int().nullable(),
      originator: z.string(),
      updatedAt: timestamp,
    }),
  ),
});

export const sheetCreatedSchema = z.object({ id: uuid, number: z.number().int(), code: z.string() });

export const sheetImportedSchema = sheetCreatedSchema.extend({
  version: z
    .number()
    .int()
    .meta({ description: 'The version holding the imported file (2: version 1 is the sheet as created).' }),
  sha256,
  attachments: z.object({
    carried: z.array(z.string()).meta({ description: 'Attachments imported from the file, their SHA-256 verified.' }),
    notCarried: z
      .array(z.string())
      .meta({ description: 'Attachments the file lists without their bytes: not imported; upload them again.' }),
  }),
});

/** What the engine answers for a sheet; the full shape is `SheetResult` in lib/calc/types.ts. */
export const sheetResultSchema = z
  .looseObject({
    ok: z.boolean(),
    cells: z.array(
      z.looseObject({
        id: z.string(),
        ok: z.boolean(),
        error: z.string().nullable(),
        statements: z.array(z.looseObject({})),
      }),
    ),
    engineVersion: z.string(),
    constantsEdition: z.string(),
  })
  .meta({
    description:
      'Per-cell, per-statement results: values with units, TeX, criteria and errors (SheetResult in lib/calc/types.ts).',
  });

const versionSummaryFields = {
  number: z.number().int(),
  parentNumber: z.number().int().nullable(),
  sha256,
  message: z.string(),
  createdAt: timestamp,
  engineVersion: z.string(),
  constantsEdition: z.string(),
  author: z.string(),
};

export const versionListSchema = z.object({ versions: z.array(z.object(versionSummaryFields)) });

export const versionSchema = z.object({
  ...versionSummaryFields,
  content: versionContentSchema,
  results: sheetResultSchema.nullable(),
});

export const sheetWithVersionSchema = z.object({
  sheet: z.object({
    id: uuid,
    project_id: uuid,
    number: z.number().int(),
    code: z.string(),
    title: z.string(),
    safety_related: z.boolean(),
    created_by: uuid,
    created_at: timestamp,
    voided_at: timestamp.nullable().meta({ description: 'When the sheet was voided; null for a sheet in use.' }),
    void_reason: z.string().nullable(),
  }),
  version: versionSchema,
});

export const sheetVoidedSchema = z.object({
  sheetId: uuid,
  status: z.literal('void'),
  voidedAt: timestamp,
  reason: z.string(),
});

export const versionSavedSchema = z.object({
  number: z.number().int(),
  sha256,
  ok: z.boolean().meta({ description: 'Whether every cell evaluated without error.' }),
});

export const comparisonSchema = z.object({
  base: z.object({ number: z.number().int(), sha256 }).nullable(),
  target: z.object({ number: z.number().int(), sha256 }),
  comparison: z
    .looseObject({
      firstCheck: z.boolean(),
      cells: z.array(
        z.looseObject({ id: z.string(), status: z.enum(['added', 'removed', 'changed', 'moved', 'unchanged']) }),
      ),
      results: z.array(
        z.looseObject({ key: z.string(), status: z.enum(['added', 'removed', 'changed', 'unchanged']) }),
      ),
      record: z
        .looseObject({
          fields: z
            .array(
              z.looseObject({
                field: z.enum([
                  'title',
                  'safetyRelated',
                  'significantFigures',
                  'displayUnits',
                  'objective',
                  'method',
                  'conclusions',
                ]),
                old: z.unknown(),
                new: z.unknown(),
              }),
            )
            .meta({
              description:
                'Record fields that differ, including the safety flag and the significant figures; text fields with a word diff.',
            }),
          inputs: z
            .array(
              z.looseObject({
                key: z.string(),
                status: z.enum(['added', 'removed', 'changed']),
                changedFields: z.array(z.enum(['value', 'source', 'sourceRevision'])),
              }),
            )
            .meta({ description: 'Design inputs matched by name, with their source revisions.' }),
          assumptions: z
            .array(z.looseObject({ key: z.string(), status: z.enum(['added', 'removed', 'changed']) }))
            .meta({ description: 'Assumptions matched by text; `changed` when the verification mark differs.' }),
          references: z.array(z.looseObject({ key: z.string(), status: z.enum(['added', 'removed', 'changed']) })),
          attachments: z
            .array(
              z.looseObject({
                key: z.string(),
                status: z
                  .enum(['added', 'removed', 'changed'])
                  .meta({ description: '`changed`: the same name with other bytes (replaced).' }),
                old: z.looseObject({ name: z.string(), size: z.number().int(), sha256 }).nullable(),
                new: z.looseObject({ name: z.string(), size: z.number().int(), sha256 }).nullable(),
                table: z
                  .looseObject({
                    oldRows: z.number().int().nullable(),
                    newRows: z.number().int().nullable(),
                    columns: z.array(
                      z.object({
                        name: z.string(),
                        status: z.enum(['added', 'removed', 'unitChanged', 'unchanged']),
                        oldUnit: z.string().nullable(),
                        newUnit: z.string().nullable(),
                      }),
                    ),
                    rows: z.array(
                      z.looseObject({
                        status: z.enum(['added', 'removed', 'changed']),
                        oldRow: z.number().int().nullable(),
                        newRow: z.number().int().nullable(),
                      }),
                    ),
                    rowCounts: z.object({
                      added: z.number().int(),
                      removed: z.number().int(),
                      changed: z.number().int(),
                    }),
                    truncated: z.boolean(),
                  })
                  .nullable()
                  .meta({
                    description:
                      'For a CSV data table on either side: the row/column diff (at most 200 row changes listed, all counted).',
                  }),
              }),
            )
            .meta({ description: 'Attachments matched by name: added, removed, replaced (name, size, SHA-256).' }),
        })
        .meta({ description: 'The calculation record and the attachments.' }),
      summary: z.looseObject({}),
    })
    .meta({
      description:
        'Cells matched by id with word diffs, results by name, criteria, the calculation record and the attachments (VersionComparison in lib/sheets/compare.ts).',
    }),
});

/** The file GET …/export sends: a sheet file (what import takes) plus what Worldsheet records with it. */
export const exportedSheetFileSchema = sheetFileSchema.extend({
  safetyRelated: z.boolean(),
  record: calculationRecordSchema,
  attachments: z
    .array(sheetFileAttachmentSchema)
    .meta({ description: 'The attachments the version cites; with `?attachments=include`, each with its bytes.' }),
  exportedFrom: z.object({ sheet: z.string(), version: z.number().int(), sha256 }),
});

export const startCandidatesSchema = z.object({
  candidates: z.array(
    z.object({
      sheetId: uuid,
      code: z.string(),
      title: z.string(),
      version: z.number().int(),
      sha256,
      kind: z.enum(['starter', 'approved']).meta({
        description:
          'starter: a starter sheet, its latest version; approved: the newest approved version of the sheet.',
      }),
    }),
  ),
});

export const sheetStartedSchema = sheetCreatedSchema.extend({
  version: z
    .number()
    .int()
    .meta({ description: 'The version holding the copy (2: version 1 is the sheet as created).' }),
  sha256,
});

/** What POST …/sheets/import/preview answers: what the import would create, checked, nothing created. */
export const importPreviewSchema = z.object({
  title: z.string(),
  safetyRelated: z.boolean(),
  calcCells: z.number().int(),
  textCells: z.number().int(),
  significantFigures: z.number().int(),
  displayUnits: z.enum(['si', 'trade']),
  exportedFrom: z.object({ sheet: z.string(), version: z.number().int(), sha256 }).nullable(),
  unchangedSinceExport: z.boolean().nullable().meta({
    description:
      'Whether the file still hashes to the SHA-256 of the version it was exported from; null when it names none.',
  }),
  attachments: z.array(
    z.object({
      name: z.string(),
      mediaType: z.string(),
      size: z.number().int(),
      sha256,
      carried: z.boolean().meta({
        description:
          'True: the file carries the bytes and they match the size and SHA-256 (the import stores them). False: listed only; not imported.',
      }),
    }),
  ),
});

export const livenessSchema = z.object({ status: z.literal('ok'), version: z.string() });

export const healthSchema = z.object({
  status: z.enum(['ok', 'unavailable', 'draining']),
  version: z.string(),
  database: z.object({
    status: z.enum(['up', 'down']),
    latencyMs: z.number().nullable(),
    migration: z.string().nullable(),
    error: z.string().optional(),
  }),
});

/** The multipart form of an attachment upload: one file. */
export const attachmentUploadFormSchema = z.object({
  file: z.file().meta({ description: 'The file; its name and media type come from the part.' }),
});

/** GET /api/sheets/{sheetId}/attachments, newest first. */
export const attachmentListSchema = z.object({ attachments: z.array(attachmentSchema) });

/** next-auth's own answers (sessions, providers, CSRF token); their shapes belong to next-auth. */
export const nextAuthBodySchema = z.looseObject({});

/** next-auth's sign-in and sign-out forms (read by next-auth, not by our zod schemas). */
export const nextAuthFormSchema = z.record(z.string(), z.string());

/** The answer of GET /api/openapi.json, described by its one fixed field. */
export const openApiDocumentSchema = z.looseObject({ openapi: z.literal('3.1.0') });

// ── Check and approval ───────────────────────────────────────────────────────────────────────

const checkState = z.enum(['in_check', 'returned', 'checked', 'approved', 'approval_returned']);
const meaning = z.enum(['prepared', 'checked', 'approved', 'issued']);

export const signatureSchema = z.object({
  id: uuid,
  versionNumber: z.number().int(),
  sha256: sha256.meta({
    description: 'SHA-256 of the signed version: the signature applies to this content only (21 CFR Part 11 §11.70).',
  }),
  printedName: z.string(),
  meaning,
  signedAt: timestamp,
  checkId: uuid.nullable(),
  userId: uuid,
});

export const sheetWorkflowSchema = z.object({
  status: z.enum(['draft', 'in_check', 'checked', 'approved', 'returned']),
  latestVersion: z.number().int(),
  lastApprovedVersion: z.number().int().nullable(),
  checks: z.array(
    z.object({
      id: uuid,
      state: checkState,
      stateLabel: z.string(),
      versionNumber: z.number().int(),
      sha256,
      checker: z.string(),
      submittedAt: timestamp,
      returnReason: z.string().nullable(),
    }),
  ),
  signatures: z.array(signatureSchema),
  checkers: z
    .array(z.object({ userId: uuid, name: z.string(), eligible: z.boolean(), reason: z.string().nullable() }))
    .meta({ description: "The project's checkers, and why any of them may not check the latest version." }),
});

export const submittedCheckSchema = z.object({
  id: uuid,
  state: z.literal('in_check'),
  versionNumber: z.number().int(),
  sha256,
});

export const checkQueueSchema = z.object({
  queue: z.enum(['check', 'approval']),
  checks: z.array(
    z.object({
      id: uuid,
      state: checkState,
      sheet: z.object({
        code: z.string(),
        title: z.string(),
        safetyRelated: z.boolean(),
        projectCode: z.string(),
        number: z.number().int(),
      }),
      versionNumber: z.number().int(),
      sha256,
      submittedBy: z.string(),
      checker: z.string(),
      submittedAt: timestamp,
      updatedAt: timestamp,
      eligible: z.boolean(),
      reason: z.string().nullable(),
    }),
  ),
});

export const checkDetailSchema = z.looseObject({
  id: uuid,
  state: checkState,
  stateLabel: z.string(),
  sheet: z.object({
    id: uuid,
    number: z.number().int(),
    code: z.string(),
    title: z.string(),
    safetyRelated: z.boolean(),
    projectCode: z.string(),
  }),
  version: z.looseObject({ number: z.number().int(), sha256, content: versionContentSchema }),
  base: z
    .looseObject({ number: z.number().int(), sha256 })
    .nullable()
    .meta({ description: 'The last approved version; null at a first check.' }),
  comparison: z.looseObject({}).meta({
    description:
      'The version against its base: cells (word diffs), results (old, new, relative change), the calculation record and attachments (as GET /api/sheets/{sheetId}/compare).',
  }),
  sinceReturn: z
    .looseObject({
      checkId: uuid,
      state: z.enum(['returned', 'approval_returned']),
      versionNumber: z.number().int(),
      sha256,
      returnedBy: z.string().nullable(),
      comparison: z.looseObject({}),
    })
    .nullable()
    .meta({
      description:
        'A re-check after a return: the returned check, its version and the comparison of that version with this one; null otherwise.',
    }),
  verificationMethod: z.enum(['design_review', 'alternate_calculation', 'qualification_test']).nullable(),
  tolerance: z.number().nullable().meta({
    description: "The checker's relative tolerance for the alternate comparison, as a fraction (0.001 for 0.1 %).",
  }),
  toleranceText: z
    .string()
    .nullable()
    .meta({ description: 'The tolerance as the checker wrote it: "1e-6", "0.1 %", "5 ppm".' }),
  alternateComparison: z
    .looseObject({
      tolerance: z.number().nullable(),
      rows: z.array(
        z.looseObject({
          name: z.string(),
          sheet: z.string(),
          alternate: z.string(),
          alternateInSheetUnit: z.string().nullable(),
          relativeDifference: z.number().nullable(),
          status: z.enum(['within', 'outside', 'no_tolerance', 'units_differ', 'not_compared']),
          words: z.string(),
        }),
      ),
      notWithin: z.number().int(),
    })
    .meta({
      description:
        "Each name defined both in the alternate cells and in the version's results: both values as displayed, |a − s| / |s| on SI values, and the outcome in words (units that differ, a zero sheet value, lists: see lib/checks/README.md).",
    }),
  acknowledgements: z
    .array(
      z.object({
        key: z.string(),
        kind: z.enum(['cell-error', 'criterion-failed', 'lint-warning', 'design-input']),
        cellId: z.string().nullable(),
        message: z.string(),
        text: z.string(),
      }),
    )
    .meta({
      description:
        'What the originator acknowledged in writing on submitting the version: each item and the acknowledgement (immutable).',
    }),
  designInputs: z
    .array(
      z.object({
        index: z.number().int(),
        name: z.string(),
        cell: z.string(),
        recordValue: z.string(),
        engineValue: z.string().nullable(),
        status: z.enum(['match', 'mismatch', 'missing-cell', 'unreadable']),
        words: z.string(),
      }),
    )
    .meta({
      description:
        "Each design input of the record that names a cell quantity: the record's value, the value the engine used, and whether they match (in SI, to the last digit written).",
    }),
  carriedOver: z
    .object({
      fromCheckId: uuid,
      fromVersion: z.number().int(),
      fields: z.array(z.enum(['verificationMethod', 'checkerNotes', 'alternateCells', 'tolerance'])),
      confirmedAt: timestamp.nullable(),
      confirmedBy: z.string().nullable(),
    })
    .nullable()
    .meta({
      description:
        "Work carried over from the returned check of an earlier version: the fields still as carried over (an edit removes one) and the checker's confirmation, which signing as checked waits for.",
    }),
  threads: z.array(
    z.object({
      id: uuid,
      cellId: z.string(),
      statementLine: z.number().int().nullable(),
      resolvedAt: timestamp.nullable(),
      resolvedBy: z.string().nullable(),
      comments: z.array(z.object({ id: uuid, author: z.string(), body: z.string(), createdAt: timestamp })),
    }),
  ),
  signatures: z.array(signatureSchema),
  you: z
    .looseObject({
      actions: z.array(z.enum(['return', 'sign', 'approve', 'reject'])),
      policy: z.record(z.string(), z.looseObject({ allowed: z.boolean(), reason: z.string().optional() })).meta({
        description:
          'Every action on the check (openThread, reply, resolveThread, recordWork, confirmCarriedOver, return, sign, approve, reject): whether the caller may take it now and, if not, why (reason, code, rule, details; for signing, waitingFor). The server refuses with the same answer.',
      }),
      signWaitsFor: z
        .array(z.string())
        .meta({ description: 'What signing as checked still waits for, as the server refuses it.' }),
    })
    .meta({ description: 'What the caller may do now (lib/checks/policy.ts).' }),
});

export const checkWorkResultSchema = z.object({ ok: z.literal(true), alternateResults: z.looseObject({}).nullable() });
export const decisionResultSchema = z.object({ id: uuid, state: checkState });

// ── Issuing, the register and verification ───────────────────────────────────────────────────

const revisionStatus = z.enum(['current', 'superseded', 'withdrawn']);

export const issueAcceptedSchema = z.object({ jobId: uuid, revision: z.string(), versionNumber: z.number().int() });

export const issueJobSchema = z.object({
  id: uuid,
  state: z.enum(['pending', 'done', 'failed']),
  step: z.string().meta({ description: 'queued, rendering, signing, storing, recording or done.' }),
  error: z.string().nullable(),
  revision: z.string(),
  versionNumber: z.number().int(),
  revisionId: uuid.nullable(),
  pdfSha256: sha256.nullable(),
  verificationCode: z.string().nullable(),
});

export const registerRowSchema = z.object({
  id: uuid,
  sheetId: uuid,
  sheet: z.string(),
  sheetNumber: z.number().int(),
  projectCode: z.string(),
  title: z.string(),
  safetyRelated: z.boolean(),
  revision: z.string(),
  status: revisionStatus,
  versionNumber: z.number().int(),
  versionSha256: sha256,
  issuedAt: timestamp,
  issuedBy: z.string(),
  pdfSha256: sha256,
  pdfSize: z.number().int(),
  verificationCode: z.string(),
  supersededBy: z.string().nullable(),
  supersededAt: timestamp.nullable(),
  withdrawnReason: z.string().nullable(),
  withdrawnAt: timestamp.nullable(),
});
export const sheetRevisionsSchema = z.object({ revisions: z.array(registerRowSchema) });
export const registerSchema = z.object({ project: z.string(), revisions: z.array(registerRowSchema) });
export const withdrawnSchema = z.object({ id: uuid, status: z.literal('withdrawn') });

export const verifyUploadFormSchema = z.object({
  file: z.string().meta({ format: 'binary', description: 'The PDF to check.' }),
});

export const verificationSchema = z.object({
  authentic: z.boolean(),
  summary: z.string(),
  revision: z
    .object({
      sheet: z.string(),
      title: z.string(),
      revision: z.string(),
      status: revisionStatus,
      issuedAt: timestamp,
      versionNumber: z.number().int(),
      versionSha256: sha256,
      pdfSha256: sha256,
      supersededBy: z.string().nullable(),
      withdrawnReason: z.string().nullable(),
      legalOwner: z.string(),
    })
    .nullable(),
  checks: z.object({
    hashInRegister: z.boolean(),
    signatureValid: z.boolean().nullable(),
    signedByOrganisation: z.boolean().nullable(),
    stampedCopy: z.boolean().meta({
      description:
        'The file is a stamped copy: a registered original as its exact prefix, then a stamp signed by document control.',
    }),
  }),
  sha256: sha256.nullable(),
});

// Citations between sheets (lib/sheets/impact.ts) and software impact (lib/sheets/software-impact.ts).
const citedValue = z
  .object({
    text: z.string(),
    number: z.number().nullable(),
    unit: z.string().nullable(),
    error: z.string().nullable(),
  })
  .meta({
    description:
      'A cited result as a revision recorded it: display text, full-precision number and unit, or its error.',
  });

export const supersededInputSchema = z.object({
  sheetId: uuid,
  sheet: z.string(),
  sheetNumber: z.number().int(),
  title: z.string(),
  revision: z.string().meta({ description: 'The revision cited, no longer current.' }),
  status: z.enum(['superseded', 'withdrawn']),
  withdrawnReason: z.string().nullable(),
  versionNumber: z.number().int(),
  currentRevision: z.string().nullable(),
  currentVersionNumber: z.number().int().nullable(),
  names: z.array(
    z.object({
      name: z.string(),
      cited: citedValue.nullable(),
      current: citedValue.nullable().meta({ description: 'Null: no longer defined, or no current revision.' }),
      changed: z.boolean(),
    }),
  ),
  compareHref: z
    .string()
    .nullable()
    .meta({ description: "The comparison page between the cited and the current revision's versions." }),
});

const impactDependentSchema = z.object({
  depth: z.number().int().meta({ description: '1: cites the revision itself; 2: cites a revision that does; …' }),
  via: z.object({
    sheetId: uuid,
    sheet: z.string(),
    sheetNumber: z.number().int(),
    revision: z.string(),
    status: revisionStatus,
  }),
  sheetId: uuid,
  sheet: z.string(),
  sheetNumber: z.number().int(),
  title: z.string(),
  versions: z.array(z.number().int()),
  names: z.array(z.string()),
  issuedAs: z.array(
    z.object({ id: uuid, revision: z.string(), status: revisionStatus, versionNumber: z.number().int() }),
  ),
  latestVersion: z.number().int(),
  latestCitesVia: z.boolean(),
  latestCitesSuperseded: z.boolean(),
});

export const sheetImpactSchema = z.object({
  sheet: z.object({ id: uuid, code: z.string(), title: z.string() }),
  supersededInputs: z.array(supersededInputSchema),
  revisions: z.array(
    z.object({
      id: uuid,
      revision: z.string(),
      status: revisionStatus,
      versionNumber: z.number().int(),
      issuedAt: timestamp,
      dependents: z.array(impactDependentSchema),
    }),
  ),
});

const facetSchema = z.object({ value: z.string(), versions: z.number().int(), revisions: z.number().int() });

export const softwareImpactSchema = z.object({
  filter: z.object({
    engineVersion: z.string().nullable(),
    constantsEdition: z.string().nullable(),
    function: z.string().nullable(),
  }),
  engineVersions: z.array(facetSchema),
  constantsEditions: z.array(facetSchema),
  rows: z
    .array(
      z.object({
        projectCode: z.string(),
        sheetId: uuid,
        sheet: z.string(),
        sheetNumber: z.number().int(),
        title: z.string(),
        safetyRelated: z.boolean(),
        versionNumber: z.number().int(),
        versionSha256: sha256,
        engineVersion: z.string().nullable(),
        constantsEdition: z.string().nullable(),
        savedAt: timestamp,
        author: z.string(),
        revision: z.string().nullable(),
        revisionId: uuid.nullable(),
        revisionStatus: revisionStatus.nullable(),
      }),
    )
    .nullable()
    .meta({ description: 'Null until a filter is given.' }),
  summary: z
    .object({
      versions: z.number().int(),
      sheets: z.number().int(),
      revisions: z.number().int(),
      currentRevisions: z.number().int(),
      safetyRelatedSheets: z.number().int(),
    })
    .nullable(),
  truncated: z.boolean(),
});
