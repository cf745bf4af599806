// The identity of a version: SHA-256 over the JSON Canonicalization Scheme form (RFC 8785) of its
// content, so the same content always gives the same hash whatever order its keys were written in.
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import type { VersionContent } from './content';

export function canonicalContent(content: VersionContent): string {
  const text = canonicalize(content);
  if (text === undefined) throw new Error('content cannot be canonicalised');
  return text;
}

export function contentHash(content: VersionContent): string {
  return createHash('sha256').update(canonicalContent(content), 'utf8').digest('hex');
}
