import crypto, { type KeyObject } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

/**
 * The firm's Ed25519 signing key. Issued sheets carry its signature over their record; the
 * public half is shown to admins so anyone can check a record outside the app.
 */
export interface FirmKey {
  readonly publicKeyPem: string;
  /** SHA-256 (hex) of the public key's SPKI DER encoding. */
  readonly fingerprint: string;
  /** The short form that issued records name: the first 16 hex digits of the fingerprint. */
  readonly keyId: string;
  /** Ed25519 signature of the UTF-8 bytes of `text`, base64. */
  sign(text: string): string;
  /** Whether `signatureBase64` is this key's signature of `text`. */
  verify(text: string, signatureBase64: string): boolean;
}

export const FIRM_KEY_FILE = 'firm-signing-key.pem';

/** The key id of a fingerprint: its first 16 hex digits (64 bits). */
export const keyIdOf = (fingerprint: string): string => fingerprint.slice(0, 16);

/** SHA-256 (hex) of the SPKI DER of a public key given as PEM. */
export function fingerprintOfPem(publicKeyPem: string): string {
  return crypto.createHash('sha256').update(crypto.createPublicKey(publicKeyPem).export({ type: 'spki', format: 'der' })).digest('hex');
}

/** Whether `signatureBase64` is the Ed25519 signature of `text` by the public key in `publicKeyPem`. */
export function verifyWithPublicKey(publicKeyPem: string, text: string, signatureBase64: string): boolean {
  const signature = Buffer.from(signatureBase64, 'base64');
  if (signature.length !== 64) return false;
  try {
    return crypto.verify(null, Buffer.from(text, 'utf8'), crypto.createPublicKey(publicKeyPem), signature);
  } catch {
    return false;
  }
}

export function firmKeyFrom(privateKey: KeyObject): FirmKey {
  const publicKey = crypto.createPublicKey(privateKey);
  const publicKeyPem = publicKey.export({ type: 'spki', format: 'pem' }).toString();
  const fingerprint = crypto.createHash('sha256').update(publicKey.export({ type: 'spki', format: 'der' })).digest('hex');
  return {
    publicKeyPem,
    fingerprint,
    keyId: keyIdOf(fingerprint),
    // Ed25519 takes no separate digest: the algorithm argument is null (Node crypto docs).
    sign: (text) => crypto.sign(null, Buffer.from(text, 'utf8'), privateKey).toString('base64'),
    verify(text, signatureBase64) {
      const signature = Buffer.from(signatureBase64, 'base64');
      if (signature.length !== 64) return false;
      return crypto.verify(null, Buffer.from(text, 'utf8'), publicKey, signature);
    },
  };
}

/** A key that lives only in memory (tests on a :memory: database). */
export function firmKeyInMemory(): FirmKey {
  return firmKeyFrom(crypto.generateKeyPairSync('ed25519').privateKey);
}

/**
 * The key kept in `dataDir` as a PKCS#8 PEM readable by the server's user only (mode 0600),
 * generated on first start. Two processes starting at once cannot both write it: the file is
 * created exclusively and the loser reads the winner's key.
 */
export function firmKeyLoadOrCreate(dataDir: string): FirmKey {
  const file = path.join(dataDir, FIRM_KEY_FILE);
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    const { privateKey } = crypto.generateKeyPairSync('ed25519');
    const pem = privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();
    try {
      fs.writeFileSync(file, pem, { mode: 0o600, flag: 'wx' });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
  }
  return firmKeyLoad(file);
}

/** Reads the key in `file` (PKCS#8 PEM); throws one sentence when it is not an Ed25519 private key. */
export function firmKeyLoad(file: string): FirmKey {
  let privateKey: KeyObject;
  try {
    privateKey = crypto.createPrivateKey(fs.readFileSync(file, 'utf8'));
  } catch {
    throw new Error(`${file} is not a readable private key in PEM form; restore the firm signing key file from your backup of the data folder.`);
  }
  if (privateKey.asymmetricKeyType !== 'ed25519') {
    throw new Error(`${file} holds a ${privateKey.asymmetricKeyType} key; the firm signing key must be Ed25519. Restore the firm's key file from your backup of the data folder.`);
  }
  return firmKeyFrom(privateKey);
}
