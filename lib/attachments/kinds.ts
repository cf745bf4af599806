// What may be attached to a sheet: reference documents (PDF, PNG, JPEG) and data tables (CSV).
// The kind is decided by the file's content (its leading bytes, or for CSV strict UTF-8 text), never
// by the name or the type the browser sends; those must agree with the content or the upload is
// refused, so that a file cannot pass for something it is not.

export type AttachmentKind = 'pdf' | 'png' | 'jpeg' | 'csv';

export interface KindSpec {
  kind: AttachmentKind;
  mediaType: string;
  /** File name extensions that declare this kind (lower case, without the dot). */
  extensions: string[];
  /** Largest accepted file, in bytes. */
  maxBytes: number;
  label: string;
}

const MiB = 1024 * 1024;

export const ATTACHMENT_KINDS: Record<AttachmentKind, KindSpec> = {
  pdf: { kind: 'pdf', mediaType: 'application/pdf', extensions: ['pdf'], maxBytes: 20 * MiB, label: 'a PDF document' },
  png: { kind: 'png', mediaType: 'image/png', extensions: ['png'], maxBytes: 10 * MiB, label: 'a PNG image' },
  jpeg: {
    kind: 'jpeg',
    mediaType: 'image/jpeg',
    extensions: ['jpg', 'jpeg'],
    maxBytes: 10 * MiB,
    label: 'a JPEG image',
  },
  csv: { kind: 'csv', mediaType: 'text/csv', extensions: ['csv'], maxBytes: 2 * MiB, label: 'a CSV table' },
};

/** The largest upload of any kind (the request is refused before reading beyond it). */
export const MAX_ATTACHMENT_BYTES = Math.max(...Object.values(ATTACHMENT_KINDS).map((k) => k.maxBytes));

export const ACCEPTED_DESCRIPTION =
  'PDF documents (up to 20 MiB), PNG or JPEG images (up to 10 MiB) and CSV tables (up to 2 MiB)';

const startsWith = (bytes: Uint8Array, signature: number[], offset = 0) =>
  signature.every((b, i) => bytes[offset + i] === b);

/**
 * The kind of a file by its content: PDF by "%PDF-" (ISO 32000-2 §7.5.2, within the first 1024
 * bytes as readers accept), PNG by its 8-byte signature (ISO/IEC 15948 §5.2), JPEG by the SOI marker
 * followed by another marker (ISO/IEC 10918-1 Annex B), CSV as UTF-8 text without control characters
 * other than tab, CR and LF (RFC 4180 with UTF-8, as RFC 7111 registers text/csv). Null otherwise.
 */
export function sniffKind(bytes: Uint8Array): AttachmentKind | null {
  if (bytes.length === 0) return null;
  const head = Buffer.from(bytes.subarray(0, 1024)).toString('latin1');
  if (head.includes('%PDF-')) return 'pdf';
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'png';
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'jpeg';
  if (isPlainUtf8Text(bytes)) return 'csv';
  return null;
}

function isPlainUtf8Text(bytes: Uint8Array): boolean {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return false;
  }
  // eslint-disable-next-line no-control-regex
  return !/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.test(text);
}

/** The kind a file name declares by its extension, or null. */
export function kindOfName(name: string): AttachmentKind | null {
  const ext = /\.([A-Za-z0-9]+)$/.exec(name)?.[1]?.toLowerCase();
  if (!ext) return null;
  return (
    (Object.values(ATTACHMENT_KINDS).find((k) => k.extensions.includes(ext))?.kind as AttachmentKind | undefined) ??
    null
  );
}

/** The kind a browser's declared media type names, or null when it says nothing useful. */
export function kindOfMediaType(type: string): AttachmentKind | null {
  const t = type.split(';')[0].trim().toLowerCase();
  if (!t || t === 'application/octet-stream') return null;
  if (t === 'application/vnd.ms-excel' || t === 'text/plain' || t === 'application/csv') return 'csv';
  if (t === 'image/jpg' || t === 'image/pjpeg') return 'jpeg';
  return (Object.values(ATTACHMENT_KINDS).find((k) => k.mediaType === t)?.kind as AttachmentKind | undefined) ?? null;
}
