import { execFileSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { canonicalJson } from './canonical-json';
import { FIRM_KEY_FILE, firmKeyInMemory, firmKeyLoadOrCreate } from './firm-key';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-key-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const hasOpenssl = (() => {
  try {
    execFileSync('openssl', ['version'], { stdio: 'pipe' });
    return true;
  } catch {
    return false;
  }
})();

describe('firm signing key', () => {
  it('when the server first starts, then an Ed25519 key is written with mode 0600 and the next start reads the same key', () => {
    const first = firmKeyLoadOrCreate(dir);
    const file = path.join(dir, FIRM_KEY_FILE);
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
    expect(crypto.createPrivateKey(fs.readFileSync(file, 'utf8')).asymmetricKeyType).toBe('ed25519');
    const again = firmKeyLoadOrCreate(dir);
    expect(again.fingerprint).toBe(first.fingerprint);
    expect(again.verify('record', first.sign('record'))).toBe(true);
  });

  it('when a signature or its text is changed by one character, then it no longer verifies', () => {
    const key = firmKeyInMemory();
    const sig = key.sign('{"a":1}');
    expect(key.verify('{"a":1}', sig)).toBe(true);
    expect(key.verify('{"a":2}', sig)).toBe(false);
    const bad = Buffer.from(sig, 'base64');
    bad[0] ^= 1;
    expect(key.verify('{"a":1}', bad.toString('base64'))).toBe(false);
    expect(key.verify('{"a":1}', 'short')).toBe(false);
    // Another firm's key does not verify our signature.
    expect(firmKeyInMemory().verify('{"a":1}', sig)).toBe(false);
  });

  it.skipIf(!hasOpenssl)('when OpenSSL checks a record signed by the firm key with the published PEM, then it verifies (Ed25519, RFC 8032)', () => {
    const key = firmKeyLoadOrCreate(dir);
    const record = canonicalJson({ sheetId: 7, pdf: { sha256: 'ab'.repeat(32) }, signers: ['Eli Marsh'] });
    fs.writeFileSync(path.join(dir, 'pub.pem'), key.publicKeyPem);
    fs.writeFileSync(path.join(dir, 'record.json'), record);
    fs.writeFileSync(path.join(dir, 'record.sig'), Buffer.from(key.sign(record), 'base64'));
    const out = execFileSync('openssl', ['pkeyutl', '-verify', '-pubin', '-inkey', 'pub.pem', '-rawin', '-in', 'record.json', '-sigfile', 'record.sig'], { cwd: dir }).toString();
    expect(out).toMatch(/Signature Verified Successfully/);
    // And the fingerprint is the SHA-256 of the DER OpenSSL derives from the same PEM.
    const der = execFileSync('openssl', ['pkey', '-pubin', '-in', 'pub.pem', '-outform', 'DER'], { cwd: dir });
    expect(crypto.createHash('sha256').update(der).digest('hex')).toBe(key.fingerprint);
  });
});

describe('canonical JSON', () => {
  it('when keys come in any order, then they are sorted by code unit with no whitespace (RFC 8785 §3.2.3)', () => {
    // Closed-form of the rule: "B" (U+0042) sorts before "a" (U+0061); nested objects too.
    expect(canonicalJson({ b: 1, a: [{ d: 'x y', c: null }], B: true })).toBe('{"B":true,"a":[{"c":null,"d":"x y"}],"b":1}');
    expect(canonicalJson({ b: 1, a: 2 })).toBe(canonicalJson({ a: 2, b: 1 }));
  });

  it('when a number is not a safe integer, then it is refused rather than formatted', () => {
    expect(() => canonicalJson({ x: 0.1 })).toThrow(/whole numbers/);
    expect(() => canonicalJson({ x: Number.NaN })).toThrow(TypeError);
  });
});
