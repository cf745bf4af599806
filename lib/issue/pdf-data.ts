// Everything the issued PDF shows, gathered by the issuing job (lib/issue/job.ts) and drawn by
// lib/issue/pdf/render.tsx. Plain data: the renderer reads nothing else.
import type { SheetResult } from '@/lib/calc/types';
import type { VersionContent } from '@/lib/sheets/content';

export interface RevisionPdfData {
  /** ISO 7200 title block fields. */
  titleBlock: {
    legalOwner: string;
    /** The sheet number, e.g. TPT2-CALC-0001. */
    identificationNumber: string;
    /** The revision being issued, e.g. "B" or "1". */
    revisionIndex: string;
    /** Date of issue, YYYY-MM-DD (UTC). */
    dateOfIssue: string;
    title: string;
    /** Always "Calculation". */
    documentType: string;
    /** The originator(s) of the versions since the last issue. */
    creator: string;
    /** The approver's printed name. */
    approvalPerson: string;
    /** "Issued" for the original; a superseded copy is stamped separately. */
    status: string;
    /** e.g. "en". */
    language: string;
    project: { code: string; name: string };
  };
  safetyRelated: boolean;
  /** The cautions of lib/safety/cautions.ts (and the safety-related one when it applies). */
  cautions: string[];
  /** Every revision of this sheet up to and including this one, oldest first. */
  revisionHistory: Array<{
    revision: string;
    date: string;
    version: number;
    description: string;
    approvedBy: string;
    status: string;
  }>;
  version: {
    number: number;
    sha256: string;
    content: VersionContent;
    results: SheetResult;
    engineVersion: string;
    constantsEdition: string;
  };
  /** The built-in constants the sheet used, with their provenance (name, value text, source). */
  constants: Array<{ name: string; value: string; provenance: string }>;
  /** Signatures of this version: prepared, checked, approved, issued. */
  signatures: Array<{ printedName: string; meaning: string; signedAt: string }>;
  /** The checker's verification method (NQA-1 name). */
  verificationMethod: string | null;
  /** The checker's alternate calculation compared with the sheet (lib/checks/alternate-comparison.ts), when they share a name. */
  /** What the originator acknowledged in writing on submitting the version (lib/checks/submission-findings.ts). */
  acknowledgements?: Array<{ item: string; text: string }>;
  /** Each design input that names a cell quantity, by its index in the record: the value the engine used and whether it matches. */
  designInputChecks?: Array<{ index: number; cell: string; engineValue: string | null; match: boolean; words: string }>;
  alternateComparison?: {
    toleranceText: string | null;
    rows: Array<{ name: string; sheet: string; alternate: string; relativeDifference: string; outcome: string }>;
  } | null;
  /** Short code to type on the verification page, e.g. "K7QF-2M9D-XW4T". */
  verificationCode: string;
  /** Where to verify, e.g. "http://127.0.0.1:3000/verify". */
  verifyUrl: string;
}
