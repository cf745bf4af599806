// The issuing organisation's signing identity. A deployment names its own key and certificate
// chain (WORLDSHEET_SIGNING_KEY and WORLDSHEET_SIGNING_CERT: PEM files, the certificate first, then
// its issuers). Without them, the first start makes a private test certificate authority and an
// organisation signing certificate in .data/keys/ (git-ignored), and reuses them afterwards: in the demo,
// development and tests only (a production deployment does not start without them, lib/config.ts).
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import forge from 'node-forge';
import { config } from '@/lib/config';
import type { SigningIdentity } from './cades';

export interface LoadedIdentity extends SigningIdentity {
  /** SHA-256 of the signing certificate's DER: what the verification page trusts. */
  certificateSha256: string;
  /** Where it came from, for messages. */
  source: string;
}

const ORGANISATION = config().WORLDSHEET_SIGNING_ORGANISATION;

function certificate(
  subject: forge.pki.CertificateField[],
  issuer: forge.pki.CertificateField[],
  publicKey: forge.pki.PublicKey,
  serial: string,
  years: number,
  extensions: object[],
) {
  const cert = forge.pki.createCertificate();
  cert.publicKey = publicKey;
  cert.serialNumber = serial;
  cert.validity.notBefore = new Date(Date.now() - 60_000);
  cert.validity.notAfter = new Date(Date.now() + years * 365 * 86_400_000);
  cert.setSubject(subject);
  cert.setIssuer(issuer);
  cert.setExtensions(extensions);
  return cert;
}

/** Makes a test CA and an organisation signing certificate (RSA 2048, SHA-256) into `folder`. */
function createTestIdentity(folder: string, organisation = ORGANISATION): void {
  mkdirSync(folder, { recursive: true, mode: 0o700 });
  const caKeys = forge.pki.rsa.generateKeyPair(2048);
  const caName = [
    { name: 'commonName', value: `${organisation} test certificate authority` },
    { name: 'organizationName', value: organisation },
  ];
  const ca = certificate(caName, caName, caKeys.publicKey, '01', 10, [
    { name: 'basicConstraints', cA: true, critical: true },
    { name: 'keyUsage', keyCertSign: true, cRLSign: true, critical: true },
    { name: 'subjectKeyIdentifier' },
  ]);
  ca.sign(caKeys.privateKey, forge.md.sha256.create());
  const keys = forge.pki.rsa.generateKeyPair(2048);
  const serial = forge.util.bytesToHex(forge.random.getBytesSync(8)).replace(/^[89a-f]/, '1');
  const org = certificate(
    [
      { name: 'commonName', value: `${organisation} document control (test)` },
      { name: 'organizationName', value: organisation },
    ],
    caName,
    keys.publicKey,
    serial,
    3,
    [
      { name: 'basicConstraints', cA: false },
      { name: 'keyUsage', digitalSignature: true, nonRepudiation: true, critical: true },
      { name: 'subjectKeyIdentifier' },
      { name: 'authorityKeyIdentifier', keyIdentifier: ca.generateSubjectKeyIdentifier().getBytes() },
    ],
  );
  org.sign(caKeys.privateKey, forge.md.sha256.create());
  writeFileSync(path.join(folder, 'ca.crt.pem'), forge.pki.certificateToPem(ca));
  writeFileSync(path.join(folder, 'ca.key.pem'), forge.pki.privateKeyToPem(caKeys.privateKey), { mode: 0o600 });
  writeFileSync(path.join(folder, 'signing.key.pem'), forge.pki.privateKeyToPem(keys.privateKey), { mode: 0o600 });
  writeFileSync(path.join(folder, 'signing.crt.pem'), forge.pki.certificateToPem(org) + forge.pki.certificateToPem(ca));
  writeFileSync(
    path.join(folder, 'README.txt'),
    'A private TEST certificate authority and signing certificate made by Worldsheet on its first start.\n' +
      'PDFs signed with them are valid but not trusted by anyone else. Never use them for real documents:\n' +
      'set WORLDSHEET_SIGNING_KEY and WORLDSHEET_SIGNING_CERT to the organisation\u2019s own key and certificate chain.\n',
  );
}

/** Splits a PEM bundle into its certificates. */
function pemCertificates(text: string): string[] {
  return text.match(/-----BEGIN CERTIFICATE-----[\s\S]+?-----END CERTIFICATE-----/g) ?? [];
}

let cached: LoadedIdentity | null = null;

function localKeyFolder(root = process.cwd()): string {
  return config().WORLDSHEET_KEY_FOLDER ?? path.join(/* turbopackIgnore: true */ root, '.data', 'keys');
}

/** The key and certificate files of the local test identity in `folder`, made when missing. */
export function localTestIdentityFiles(folder = localKeyFolder()): { keyFile: string; certFile: string } {
  const keyFile = path.join(folder, 'signing.key.pem');
  const certFile = path.join(folder, 'signing.crt.pem');
  if (!existsSync(/* turbopackIgnore: true */ keyFile) || !existsSync(/* turbopackIgnore: true */ certFile))
    createTestIdentity(folder);
  return { keyFile, certFile };
}

/** The signing identity from the configuration, or the local test one (made when missing). */
export function signingIdentity(): LoadedIdentity {
  if (cached) return cached;
  let keyFile = config().WORLDSHEET_SIGNING_KEY;
  let certFile = config().WORLDSHEET_SIGNING_CERT;
  let source = 'configured key and certificate';
  if (!keyFile || !certFile) {
    const folder = localKeyFolder();
    ({ keyFile, certFile } = localTestIdentityFiles(folder));
    source = `local test certificate authority in ${folder}`;
  }
  const certificatePems = pemCertificates(readFileSync(/* turbopackIgnore: true */ certFile, 'utf8'));
  if (certificatePems.length === 0) throw new Error(`${certFile} holds no certificate`);
  const keyPem = readFileSync(/* turbopackIgnore: true */ keyFile, 'utf8');
  const der = Buffer.from(
    forge.asn1.toDer(forge.pki.certificateToAsn1(forge.pki.certificateFromPem(certificatePems[0]))).getBytes(),
    'binary',
  );
  cached = { keyPem, certificatePems, certificateSha256: createHash('sha256').update(der).digest('hex'), source };
  return cached;
}
