// The statement forms, in the order they are tried: the first that recognises a statement owns it.
// Adding a form: a file beside these exporting a StatementForm (statement.ts), listed here before
// `expression`, which takes every statement no other form recognises.
import type { StatementForm } from '../statement';
import { citation } from './citation';
import { correlation } from './correlation';
import { criterion } from './criterion';
import { definition } from './definition';
import { expression } from './expression';
import { functionDefinition } from './function-definition';
import { study } from './study';
import { uncertainInput } from './uncertain-input';

export const FORMS: readonly StatementForm[] = [
  uncertainInput,
  citation,
  definition,
  functionDefinition,
  criterion,
  correlation,
  study,
  expression,
];
